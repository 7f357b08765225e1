// Throttles sign-up and password-reset requests per e-mail and per IP address. Every request
// counts, whether or not the e-mail belongs to an account, so the answer reveals nothing.
import type { Tx } from './db';
import { ACCOUNT_REQUEST_LIMITS, accountRequestWait } from '../domain/account-tokens';
import { TooManyRequestsError } from './errors';

export type AccountRequestKind = 'signup' | 'reset';

async function countSince(db: Tx, kind: AccountRequestKind, column: 'email' | 'ip', value: string, since: Date) {
  const row = (await db('account_requests')
    .where({ kind, [column]: value })
    .andWhere('at', '>', since)
    .count<{ count: string }[]>('* as count')
    .min('at as oldest')
    .first()) as unknown as { count: string; oldest: Date | null } | undefined;
  return { count: Number(row?.count ?? 0), oldest: row?.oldest ?? null };
}

/** Records the request, or throws 429 with Retry-After when the limit is reached. */
export async function recordAccountRequest(db: Tx, kind: AccountRequestKind, email: string, ip: string, now = new Date()): Promise<void> {
  const key = email.trim().toLowerCase();
  const since = new Date(now.getTime() - ACCOUNT_REQUEST_LIMITS.windowMin * 60_000);
  const [byEmail, byIp] = await Promise.all([countSince(db, kind, 'email', key, since), countSince(db, kind, 'ip', ip, since)]);
  const wait = accountRequestWait({ email: byEmail, ip: byIp }, now);
  if (wait > 0) {
    const what = kind === 'signup' ? 'sign-up requests' : 'password reset requests';
    throw new TooManyRequestsError(`Too many ${what}. Try again in ${Math.ceil(wait / 60)} minutes.`, wait);
  }
  await db('account_requests').insert({ kind, email: key, ip, at: now });
}
