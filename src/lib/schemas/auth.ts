import { z } from 'zod';

/** E-mail addresses are compared trimmed, NFKC-normalised and in lower case. */
export function normaliseEmail(email: string): string {
  return email.trim().normalize('NFKC').toLowerCase();
}

export const LoginSchema = z.object({
  email: z.string().trim().min(1, 'Enter your e-mail').email('Enter a valid e-mail address').max(254).transform(normaliseEmail),
  password: z.string().min(1, 'Enter your password').max(200),
  next: z.string().optional(),
});
export type LoginInput = z.infer<typeof LoginSchema>;

const NEXT_BASE = 'http://bearline.invalid';

/**
 * Where to go after sign-in: only a path on this site. The text is parsed as a URL against a
 * placeholder origin and refused unless it stays there; control characters (tab and newline
 * are dropped by URL parsers, turning `/\t/evil.test` into `//evil.test`) and backslashes
 * (read as `/` by browsers) are refused outright.
 */
export function safeNextPath(next: string | undefined | null): string {
  if (typeof next !== 'string' || next.length === 0 || next.length > 2000) return '/';
  // eslint-disable-next-line no-control-regex
  if (!next.startsWith('/') || /[\u0000-\u001f\u007f\\]/.test(next)) return '/';
  let url: URL;
  try {
    url = new URL(next, NEXT_BASE);
  } catch {
    return '/';
  }
  if (url.origin !== NEXT_BASE) return '/';
  const path = url.pathname + url.search + url.hash;
  return path.startsWith('//') ? '/' : path;
}

/** What the sign-in page may say after a failed form sign-in: chosen by code, never by link text. */
export const LOGIN_ERRORS = {
  credentials: 'Wrong e-mail or password',
  disabled: 'This account is disabled. Ask an admin to enable it.',
  throttled: 'Too many failed sign-ins. Wait a little and try again.',
  invalid: 'Enter your e-mail address and password.',
  unavailable: 'Bearline cannot reach its database just now. Try again in a minute.',
  failed: 'Signing in did not work. Try again.',
} as const;
export type LoginErrorCode = keyof typeof LOGIN_ERRORS;

/** The message for `?error=`; null when there is none, the generic one for unknown codes. */
export function loginErrorMessage(code: string | null): string | null {
  if (!code) return null;
  return Object.hasOwn(LOGIN_ERRORS, code) ? LOGIN_ERRORS[code as LoginErrorCode] : LOGIN_ERRORS.failed;
}
