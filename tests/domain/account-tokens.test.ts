import { describe, expect, it } from 'vitest';
import { ACCOUNT_REQUEST_LIMITS, TOKEN_LIFETIME_MIN, accountRequestWait, tokenExpiry, tokenState } from '../../src/lib/domain/account-tokens';

const now = new Date('2026-03-01T12:00:00Z');
const at = (minutes: number) => new Date(now.getTime() + minutes * 60_000);

describe('link lifetimes (common practice)', () => {
  it.each([
    ['reset', 60],
    ['signup', 24 * 60],
    ['invite', 7 * 24 * 60],
  ] as const)('a %s link lives %i minutes', (purpose, minutes) => {
    expect(TOKEN_LIFETIME_MIN[purpose]).toBe(minutes);
    expect(tokenExpiry(purpose, now)).toEqual(at(minutes));
  });
});

describe('tokenState', () => {
  it.each([
    [{ usedAt: null, expiresAt: at(1) }, 'usable'],
    [{ usedAt: null, expiresAt: now }, 'expired'],
    [{ usedAt: null, expiresAt: at(-1) }, 'expired'],
    [{ usedAt: at(-5), expiresAt: at(30) }, 'used'],
    [{ usedAt: at(-5), expiresAt: at(-1) }, 'used'],
  ])('%j is %s', (token, state) => {
    expect(tokenState(token, now)).toBe(state);
  });
});

describe('accountRequestWait', () => {
  const none = { count: 0, oldest: null };
  it('lets a request through under both limits', () => {
    expect(accountRequestWait({ email: { count: ACCOUNT_REQUEST_LIMITS.perEmail - 1, oldest: at(-10) }, ip: none }, now)).toBe(0);
  });
  it('waits until the oldest request in the window leaves it (per e-mail)', () => {
    expect(accountRequestWait({ email: { count: ACCOUNT_REQUEST_LIMITS.perEmail, oldest: at(-10) }, ip: none }, now)).toBe(50 * 60);
  });
  it('takes the longer wait when both limits are reached', () => {
    const wait = accountRequestWait({ email: { count: 3, oldest: at(-50) }, ip: { count: ACCOUNT_REQUEST_LIMITS.perIp, oldest: at(-20) } }, now);
    expect(wait).toBe(40 * 60);
  });
  it('never answers less than one second once limited', () => {
    expect(accountRequestWait({ email: { count: 3, oldest: at(-60) }, ip: none }, now)).toBe(1);
  });
});
