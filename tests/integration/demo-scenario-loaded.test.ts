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

  it('books visits from the day it was loaded: past due, this week and later', async () => {
    const today = new Date().toISOString().slice(0, 10);
    const days = (await db('plans').where({ state: 'scheduled' }).select(db.raw("to_char(scheduled_for, 'YYYY-MM-DD') AS day"))).map((r) => r.day as string);
    expect(days.some((d) => d < today)).toBe(true);
    expect(days).toContain(today);
    expect(days.some((d) => d > today)).toBe(true);
  });

  it('has a coverage gap in every region: a customer whose best prediction is below −100 dBm (graded poor)', async () => {
    // The rule of lib/domain/coverage-gaps.ts: the strongest predicted RSRP of a customer's plans < −100 dBm.
    const { rows } = await db.raw(
      `SELECT r.id, count(best.customer_id)::int AS gaps FROM regions r
         LEFT JOIN (SELECT cu.id AS customer_id, cu.geom, max((p.figures->>'predicted_rsrp_dbm')::float8) AS rsrp
                      FROM customers cu JOIN plans p ON p.customer_id = cu.id GROUP BY cu.id) best
           ON ST_Contains(r.geom, best.geom) AND best.rsrp < -100
        GROUP BY r.id`,
    );
    expect(rows.length).toBeGreaterThan(0);
    for (const r of rows) expect(r.gaps).toBeGreaterThan(0);
  });

  it('writes addresses without a space before a comma', async () => {
    expect(await count('addresses', (q) => q.whereRaw("label ~ '\\s,'"))).toBe(0);
    expect(await count('customers', (q) => q.whereRaw("address_label ~ '\\s,'"))).toBe(0);
  });
});
