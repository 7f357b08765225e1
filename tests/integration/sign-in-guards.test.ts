// Sign-in under attack: throttling that slows guessing without locking the right password out,
// per-address limits, e-mail normalisation, the unknown-e-mail path, and where `next` may lead.
import { beforeEach, describe, expect, it } from 'vitest';
import { POST as login } from '../../src/pages/api/auth/login';
import { ACCOUNT_FREE_FAILURES, ACCOUNT_MAX_DELAY_S, IP_FAILURE_LIMIT, accountDelaySeconds, authenticate } from '../../src/lib/server/auth';
import { AppError } from '../../src/lib/server/errors';
import { LOGIN_ERRORS, loginErrorMessage, safeNextPath } from '../../src/lib/schemas/auth';
import { call } from '../helpers/endpoint';
import { testDb, truncateAll } from '../helpers/db';
import { makeUser, TEST_PASSWORD } from '../helpers/factories';

async function attempt(email: string, password: string, ip: string): Promise<number> {
  try {
    await authenticate(email, password, ip);
    return 200;
  } catch (err) {
    if (err instanceof AppError) return err.code === 'TOO_MANY_REQUESTS' ? 429 : 401;
    throw err;
  }
}

/** Moves every recorded failure back in time, as if that many seconds had passed. */
async function wait(seconds: number) {
  await testDb().raw(`UPDATE login_failures SET at = at - make_interval(secs => ?)`, [seconds]);
}

describe('sign-in throttling', () => {
  beforeEach(truncateAll);

  it('doubles the wait per account after the free failures, capped (common practice)', () => {
    expect([1, 2, 3].map(accountDelaySeconds)).toEqual([0, 0, 0]);
    expect([4, 5, 6, 7].map(accountDelaySeconds)).toEqual([1, 2, 4, 8]);
    expect(accountDelaySeconds(50)).toBe(ACCOUNT_MAX_DELAY_S);
  });

  it('slows an account under attack but lets the right password in once the wait is over', async () => {
    await makeUser('planner', { email: 'target@example.test' });
    // Ten failures from ten addresses, each given the time it asked for.
    for (let i = 0; i < 10; i++) {
      expect(await attempt('target@example.test', 'guess-' + i, `198.51.100.${i}`)).toBe(401);
      await wait(ACCOUNT_MAX_DELAY_S);
    }
    // One more failure right now: the account must wait before the next try…
    expect(await attempt('target@example.test', 'guess-x', '198.51.100.77')).toBe(401);
    expect(await attempt('target@example.test', 'guess-y', '198.51.100.78')).toBe(429);
    const refused = await call(login, { json: { email: 'target@example.test', password: TEST_PASSWORD } });
    expect(refused.status).toBe(429);
    const retryAfter = Number(refused.headers.get('retry-after'));
    expect(retryAfter).toBeGreaterThan(0);
    expect(retryAfter).toBeLessThanOrEqual(ACCOUNT_MAX_DELAY_S);
    // …and once it has waited, the real user is not locked out.
    await wait(retryAfter);
    expect(await attempt('target@example.test', TEST_PASSWORD, '203.0.113.5')).toBe(200);
    const [{ count }] = await testDb()('login_failures').where({ email: 'target@example.test' }).count();
    expect(Number(count)).toBe(0);
  });

  it('limits failures per address over all accounts (password spraying)', async () => {
    for (let i = 0; i < IP_FAILURE_LIMIT; i++) {
      expect(await attempt(`user${i}@example.test`, 'Summer2025!', '192.0.2.66')).toBe(401);
    }
    expect(await attempt('another@example.test', 'Summer2025!', '192.0.2.66')).toBe(429);
    // Another address is not affected.
    expect(await attempt('another@example.test', 'Summer2025!', '192.0.2.67')).toBe(401);
  });

  it('counts spellings of one e-mail as one account', async () => {
    await makeUser('planner', { email: 'case@example.test' });
    for (let i = 0; i < ACCOUNT_FREE_FAILURES + 5; i++) {
      const spelling = ['CASE@example.test', ' case@EXAMPLE.TEST ', 'Case@Example.Test', 'case@example.test'][i % 4]!;
      expect(await attempt(spelling, 'wrong-password', `198.51.100.${i}`)).toBe(401);
      await wait(ACCOUNT_MAX_DELAY_S);
    }
    // Nine failures on one account under four spellings: the next try must wait.
    expect(await attempt('cAsE@example.test', 'wrong-password', '198.51.100.98')).toBe(401);
    expect(await attempt('CaSe@example.test', 'wrong-password', '198.51.100.99')).toBe(429);
    const rows = await testDb()('login_failures').distinct('email');
    expect(rows).toEqual([{ email: 'case@example.test' }]);
  });

  it('takes about as long for an unknown e-mail as for a wrong password (dummy hash)', async () => {
    await makeUser('planner', { email: 'known@example.test' });
    await attempt('warm@example.test', 'x', '192.0.2.1'); // first call builds the dummy hash
    // CPU time of this process (argon2 runs on its worker threads): steadier than wall time on a busy machine.
    const time = async (email: string, ip: string) => {
      const before = process.cpuUsage();
      await attempt(email, 'wrong-password', ip);
      const used = process.cpuUsage(before);
      return used.user + used.system;
    };
    const known = Math.min(await time('known@example.test', '192.0.2.2'), await time('known@example.test', '192.0.2.3'));
    const unknown = Math.min(await time('ghost@example.test', '192.0.2.4'), await time('ghost@example.test', '192.0.2.5'));
    // argon2id verification dominates both; without the dummy hash the unknown path costs a few queries.
    expect(unknown).toBeGreaterThan(known * 0.5);
  });
});

describe('redirect after sign-in (next=)', () => {
  it.each([
    ['/admin/users', '/admin/users'],
    ['/plan?customer=12#map', '/plan?customer=12#map'],
    ['/a/../admin', '/admin'],
    ['//evil.test/x', '/'],
    ['/\\evil.test', '/'],
    ['/\t/evil.test', '/'],
    ['/\n/evil.test', '/'],
    ['\\\\evil.test', '/'],
    ['https://evil.test/', '/'],
    ['http:/evil.test', '/'],
    ['javascript:alert(1)', '/'],
    ['/%2F%2Fevil.test', '/%2F%2Fevil.test'],
    ['', '/'],
    ['/' + 'x'.repeat(3000), '/'],
  ])('%j goes to %j', (next, expected) => {
    expect(safeNextPath(next)).toBe(expected);
  });

  it('never answers 500 for a hostile next on the form sign-in', async () => {
    await truncateAll();
    await makeUser('reviewer', { email: 'r@example.test' });
    for (const next of ['/\r\nSet-Cookie: x=1', '//\tevil.test', '/\\/evil.test']) {
      const res = await call(login, { form: { email: 'r@example.test', password: TEST_PASSWORD, next } });
      expect(res.status).toBe(303);
      expect(res.headers.get('location')).toBe('/');
    }
    // A NUL byte makes the whole form invalid: back to the sign-in page, still on this site.
    const nul = await call(login, { form: { email: 'r@example.test', password: TEST_PASSWORD, next: '/\u0000' } });
    expect(nul.headers.get('location')).toBe('/login?error=invalid&next=%2F');
  });
});

describe('sign-in page messages', () => {
  it('shows messages by code only, never the text a link carries', () => {
    expect(loginErrorMessage('credentials')).toBe(LOGIN_ERRORS.credentials);
    expect(loginErrorMessage('Your account is suspended, call +1 555 0100')).toBe(LOGIN_ERRORS.failed);
    expect(loginErrorMessage('toString')).toBe(LOGIN_ERRORS.failed);
    expect(loginErrorMessage(null)).toBeNull();
  });
});
