// The whole demo scenario as `npm start` loads it (the invented island region of src/lib/demo): checked on the
// database the browser tests use, which scripts/test.ts seeds with every seed in order.
import { afterAll, describe, expect, it } from 'vitest';
import { connect } from '../../scripts/lib/migrate-runner';

const url = process.env.E2E_DATABASE_URL;
if (!url) throw new Error('This test reads the seeded demo database: run it through `npm test` (E2E_DATABASE_URL)');
const db = connect(url);
afterAll(async () => {
  await db.destroy();
});

const count = async (table: string, where?: (q: import('knex').Knex.QueryBuilder) => void) => {
  const q = db(table).count<{ n: string }[]>('* as n');
  where?.(q);
  return Number((await q.first())!.n);
};

describe('the loaded demo scenario', () => {
  it('has about 40 masts, 150 cells on three operators of MCC 001, and a user per role', async () => {
    expect(await count('masts')).toBeGreaterThanOrEqual(35);
    expect(await count('cells')).toBeGreaterThanOrEqual(130);
    const ops = await db('operators').select('mcc');
    expect(ops).toHaveLength(3);
    expect(ops.every((o) => o.mcc === '001')).toBe(true);
    expect(await count('users')).toBe(5);
  });

  it('keeps thousands of survey readings after every later seed ran', async () => {
    expect(await count('readings', (q) => q.whereNull('install_check_id'))).toBeGreaterThan(2000);
  });

  it('has a few hundred addresses, a dozen customers with plans in every state, and elevation data', async () => {
    expect(await count('addresses')).toBeGreaterThanOrEqual(200);
    expect(await count('customers')).toBeGreaterThanOrEqual(10);
    const states = (await db('plans').distinct('state')).map((r) => r.state).sort();
    expect(states).toEqual(['enquiry', 'installed', 'planned', 'scheduled', 'verified']);
    expect(await count('elevation_grids')).toBe(1);
    // Verified installs fed their after-install readings back for calibration.
    expect(await count('readings', (q) => q.whereNotNull('install_check_id'))).toBeGreaterThan(0);
  });
});
