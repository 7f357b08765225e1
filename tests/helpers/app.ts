// HTTP client for the app started by scripts/test.ts (APP_URL), demo scenario loaded.
export const APP_URL = process.env.APP_URL ?? 'http://127.0.0.1:4321';
export const DEMO_PASSWORD = 'bearline-demo';
export const demoEmail = (role: string) => `${role}@demo.bearline.test`;

/** Signs in through the JSON endpoint and returns the session cookie header. */
export async function signInCookie(role: string): Promise<string> {
  const res = await fetch(`${APP_URL}/api/auth/login`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', origin: APP_URL },
    body: JSON.stringify({ email: demoEmail(role), password: DEMO_PASSWORD }),
  });
  if (res.status !== 200) throw new Error(`sign-in as ${role} failed: ${res.status} ${await res.text()}`);
  const cookie = res.headers.get('set-cookie');
  if (!cookie) throw new Error('no session cookie');
  return cookie.split(';')[0];
}

export function appFetch(path: string, init: RequestInit & { cookie?: string } = {}): Promise<Response> {
  const headers = new Headers(init.headers);
  if (init.cookie) headers.set('cookie', init.cookie);
  return fetch(`${APP_URL}${path}`, { ...init, headers, redirect: 'manual' });
}
