// Rules for the single-use links mailed to people: how long each kind lives and whether one
// may still be used. Pure: the caller passes the clock.

export const TOKEN_PURPOSES = ['signup', 'reset', 'invite'] as const;
export type TokenPurpose = (typeof TOKEN_PURPOSES)[number];

/**
 * Lifetimes: a reset link is short-lived because it signs a person in (one hour is common
 * practice); a sign-up link waits a day for the mail to be read; an invitation a week, since
 * a new colleague may not start straight away (common practice).
 */
export const TOKEN_LIFETIME_MIN: Record<TokenPurpose, number> = {
  signup: 24 * 60,
  reset: 60,
  invite: 7 * 24 * 60,
};

export function tokenExpiry(purpose: TokenPurpose, now: Date): Date {
  return new Date(now.getTime() + TOKEN_LIFETIME_MIN[purpose] * 60_000);
}

export type TokenState = 'usable' | 'used' | 'expired';

export function tokenState(token: { usedAt: Date | null; expiresAt: Date }, now: Date): TokenState {
  if (token.usedAt) return 'used';
  if (token.expiresAt.getTime() <= now.getTime()) return 'expired';
  return 'usable';
}

/** What a person is told when a link cannot be used; the same words whatever the purpose. */
export const TOKEN_PROBLEM: Record<Exclude<TokenState, 'usable'> | 'unknown', string> = {
  used: 'This link has already been used. Each link works once.',
  expired: 'This link has expired. Ask for a new one.',
  unknown: 'This link is not valid. Check that the whole address was copied, or ask for a new one.',
};

// --- Throttling of sign-up and reset requests ----------------------------------------------

/** Per e-mail address and per IP address, within the window (common practice). */
export const ACCOUNT_REQUEST_LIMITS = { perEmail: 3, perIp: 20, windowMin: 60 } as const;

export interface RequestCounts {
  /** Requests already made in the window, with the time of the oldest. */
  email: { count: number; oldest: Date | null };
  ip: { count: number; oldest: Date | null };
}

/** Seconds to wait before the next request, or 0 when one may be made now. */
export function accountRequestWait(counts: RequestCounts, now: Date, limits = ACCOUNT_REQUEST_LIMITS): number {
  const waits = [
    { c: counts.email, limit: limits.perEmail },
    { c: counts.ip, limit: limits.perIp },
  ]
    .filter(({ c, limit }) => c.count >= limit && c.oldest)
    .map(({ c }) => Math.ceil((c.oldest!.getTime() + limits.windowMin * 60_000 - now.getTime()) / 1000));
  return waits.length ? Math.max(1, ...waits) : 0;
}
