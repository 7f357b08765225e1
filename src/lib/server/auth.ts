// Sessions (lucia v3) and sign-in with throttling.
import { Lucia, TimeSpan } from 'lucia';
import { getDb } from './db';
import { KnexSessionAdapter } from './session-adapter';
import { findUserForLogin, type User } from './repos/users';
import { clearLoginFailures, countLoginFailures, recordLoginFailure } from './repos/login-failures';
import { randomBytes } from 'node:crypto';
import { hashPassword, verifyPassword } from './password';
import { normaliseEmail } from '../schemas/auth';
import { AccountDisabledError, TooManyRequestsError, UnauthorizedError } from './errors';
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

// Throttling of failed sign-ins (kept in login_failures, so it holds across app servers):
// - per account: the first ACCOUNT_FREE_FAILURES failures in the window cost nothing; after
//   that each attempt must wait 1 s, 2 s, 4 s … up to ACCOUNT_MAX_DELAY_S since the last
//   failure. The right password still gets in once the (short) wait is over: nobody can lock
//   a user out by failing on purpose.
// - per client address: at most IP_FAILURE_LIMIT failures in the window over all accounts
//   (password spraying), then 429 until the oldest leaves the window.
// Addresses are the socket peer, or X-Forwarded-For from TRUSTED_PROXIES only (server/serve.mjs).
export const THROTTLE_WINDOW_MIN = 15;
export const ACCOUNT_FREE_FAILURES = 3;
export const ACCOUNT_MAX_DELAY_S = 60;
export const IP_FAILURE_LIMIT = 30;

/** Seconds an account must wait after `failures` failed sign-ins in the window (0: none). */
export function accountDelaySeconds(failures: number): number {
  if (failures <= ACCOUNT_FREE_FAILURES) return 0;
  return Math.min(ACCOUNT_MAX_DELAY_S, 2 ** (failures - ACCOUNT_FREE_FAILURES - 1));
}

async function assertNotThrottled(email: string, ip: string): Promise<void> {
  const now = Date.now();
  const since = new Date(now - THROTTLE_WINDOW_MIN * 60_000);
  const { byEmail, byIp } = await countLoginFailures(getDb(), email, ip, since);
  if (byIp.count >= IP_FAILURE_LIMIT && byIp.first) {
    const retryAfter = Math.max(1, Math.ceil((byIp.first.getTime() + THROTTLE_WINDOW_MIN * 60_000 - now) / 1000));
    throw new TooManyRequestsError(`Too many failed sign-ins from your address. Try again in ${Math.ceil(retryAfter / 60)} minutes.`, retryAfter);
  }
  const delay = accountDelaySeconds(byEmail.count);
  if (delay > 0 && byEmail.last) {
    const retryAfter = Math.ceil((byEmail.last.getTime() + delay * 1000 - now) / 1000);
    if (retryAfter > 0) throw new TooManyRequestsError(`Too many failed sign-ins. Try again in ${retryAfter} seconds.`, retryAfter);
  }
}

// Unknown e-mails are checked against this, so they take as long as a wrong password.
let dummyHash: Promise<string> | null = null;
function getDummyHash(): Promise<string> {
  dummyHash ??= hashPassword(randomBytes(18).toString('base64'));
  return dummyHash;
}

/** Checks the credentials; returns the user or throws 401/429 with one message for every failure. */
export async function authenticate(rawEmail: string, password: string, ip: string): Promise<User> {
  const email = normaliseEmail(rawEmail);
  await assertNotThrottled(email, ip);
  const user = await findUserForLogin(getDb(), email);
  const ok = user !== null ? await verifyPassword(user.passwordHash, password) : (await verifyPassword(await getDummyHash(), password)) && false;
  if (!user || !ok || user.disabledAt) {
    await recordLoginFailure(getDb(), email, ip);
    // Disabled accounts get their own message only after a correct password.
    if (user && ok && user.disabledAt) throw new AccountDisabledError();
    throw new UnauthorizedError('Wrong e-mail or password');
  }
  await clearLoginFailures(getDb(), email);
  const { passwordHash: _omit, ...plain } = user;
  return plain;
}
