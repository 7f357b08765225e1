// Sessions (lucia v3) and sign-in with throttling.
import { Lucia, TimeSpan } from 'lucia';
import { getDb } from './db';
import { KnexSessionAdapter } from './session-adapter';
import { findUserForLogin, type User } from './repos/users';
import { verifyPassword } from './password';
import { TooManyRequestsError, UnauthorizedError } from './errors';
import type { Role } from '../domain/roles';

export const SESSION_DAYS = 14;

export const lucia = new Lucia(new KnexSessionAdapter(getDb), {
  sessionExpiresIn: new TimeSpan(SESSION_DAYS, 'd'),
  sessionCookie: {
    name: 'bearline_session',
    // `secure` is decided per request (see setSessionCookie): https only.
    attributes: { secure: false, sameSite: 'lax' },
  },
  getUserAttributes: (attributes) => ({
    email: attributes.email,
    name: attributes.name,
    role: attributes.role,
    disabledAt: attributes.disabled_at,
  }),
});

declare module 'lucia' {
  interface Register {
    Lucia: typeof lucia;
    DatabaseUserAttributes: { email: string; name: string; role: Role; disabled_at: Date | null };
  }
}

interface CookieJar {
  set(name: string, value: string, options: Record<string, unknown>): void;
}

/** Sets the session cookie (or a blank one); Secure whenever the app is reached over https. */
export function setSessionCookie(cookies: CookieJar, url: URL, sessionId: string | null): void {
  const cookie = sessionId ? lucia.createSessionCookie(sessionId) : lucia.createBlankSessionCookie();
  cookies.set(cookie.name, cookie.value, { ...cookie.attributes, secure: url.protocol === 'https:' });
}

// Throttle: at most this many failed sign-ins per e-mail and per IP in the window.
export const THROTTLE_LIMIT = 10;
export const THROTTLE_WINDOW_MIN = 15;

async function assertNotThrottled(email: string, ip: string): Promise<void> {
  const db = getDb();
  const since = new Date(Date.now() - THROTTLE_WINDOW_MIN * 60_000);
  const [byEmail, byIp] = await Promise.all([
    db('login_failures').whereRaw('lower(email) = lower(?)', [email]).andWhere('at', '>', since).count<{ count: string }[]>('* as count').min('at as first').first(),
    db('login_failures').where({ ip }).andWhere('at', '>', since).count<{ count: string }[]>('* as count').min('at as first').first(),
  ]);
  for (const row of [byEmail, byIp]) {
    if (Number(row?.count ?? 0) >= THROTTLE_LIMIT) {
      const first = new Date((row as unknown as { first: Date }).first).getTime();
      const retryAfter = Math.max(1, Math.ceil((first + THROTTLE_WINDOW_MIN * 60_000 - Date.now()) / 1000));
      throw new TooManyRequestsError(`Too many failed sign-ins. Try again in ${Math.ceil(retryAfter / 60)} minutes.`, retryAfter);
    }
  }
}

/** Checks the credentials; returns the user or throws 401/429 with one message for every failure. */
export async function authenticate(email: string, password: string, ip: string): Promise<User> {
  await assertNotThrottled(email, ip);
  const user = await findUserForLogin(getDb(), email);
  const ok = user !== null && (await verifyPassword(user.passwordHash, password));
  if (!user || !ok || user.disabledAt) {
    await getDb()('login_failures').insert({ email: email.toLowerCase(), ip });
    // Disabled accounts get their own message only after a correct password.
    if (user && ok && user.disabledAt) throw new UnauthorizedError('This account is disabled. Ask an admin to enable it.');
    throw new UnauthorizedError('Wrong e-mail or password');
  }
  await getDb()('login_failures').whereRaw('lower(email) = lower(?)', [email]).delete();
  const { passwordHash: _omit, ...plain } = user;
  return plain;
}
