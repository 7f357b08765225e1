// The regions page's reading counts, taken from the signal map's hexagons, against a direct count of
// the readings inside each outline: on the seeded demo database, inside a transaction that is rolled
// back, with the hexagons current, with changes not yet binned, and after everything changed.
import { afterAll, describe, expect, it } from 'vitest';
import type { Knex } from 'knex';
import { connect } from '../../scripts/lib/migrate-runner';
import { listRegionCounts } from '../../src/lib/server/repos/region-counts';
import { refreshReadingHexes } from '../../src/lib/server/repos/reading-hexes';

const url = process.env.E2E_DATABASE_URL;
if (!url) throw new Error('This test reads the seeded demo database: run it through `npm test` (E2E_DATABASE_URL)');
const db = connect(url);
afterAll(async () => {
  await db.destroy();
});

class Rollback extends Error {}

/** Runs `fn` in a transaction that is always rolled back: the demo database is left as it was. */
async function inRolledBack(fn: (trx: Knex.Transaction) => Promise<void>): Promise<void> {
  await db
    .transaction(async (trx) => {
      await fn(trx);
      throw new Rollback();
    })
    .catch((err) => {
      if (!(err instanceof Rollback)) throw err;
    });
}

async function directCounts(trx: Knex.Transaction, seesCustomers: boolean): Promise<Record<string, number>> {
  const { rows } = await trx.raw<{ rows: Array<{ id: string; n: number }> }>(
    `SELECT g.id, (SELECT count(*) FROM readings x WHERE ST_Intersects(x.geom, g.geom) ${seesCustomers ? '' : 'AND x.install_check_id IS NULL'})::int AS n
       FROM regions g`,
  );
  return Object.fromEntries(rows.map((r) => [String(r.id), r.n]));
}

async function expectExactCounts(trx: Knex.Transaction): Promise<number> {
  let total = 0;
  for (const seesCustomers of [true, false]) {
    const listed = await listRegionCounts(trx, { seesCustomers });
    const direct = await directCounts(trx, seesCustomers);
    expect(Object.fromEntries(listed.map((r) => [r.id, r.readings])), `seesCustomers ${seesCustomers}`).toEqual(direct);
    total += Object.values(direct).reduce((a, b) => a + b, 0);
  }
  return total;
}

describe('reading counts of the regions page', () => {
  it('equal a direct count of the readings inside each outline, whatever the state of the hexagons', { timeout: 120_000 }, async () => {
    await inRolledBack(async (trx) => {
      // Outlines crossing the readings at an angle and at every size: hexagons cut by the outline at every level.
      const { rows: ext } = await trx.raw<{ rows: Array<{ w: number; s: number; e: number; n: number }> }>(
        'SELECT ST_XMin(e) AS w, ST_YMin(e) AS s, ST_XMax(e) AS e, ST_YMax(e) AS n FROM (SELECT ST_Extent(geom)::geometry AS e FROM readings) t',
      );
      const { w, s, e, n } = ext[0]!;
      const cx = (w + e) / 2;
      const cy = (s + n) / 2;
      for (const [name, r] of [
        ['Cut small', 0.02],
        ['Cut middling', 0.08],
        ['Cut large', Math.max(e - w, n - s)],
        ['Cut wide', 3],
      ] as const) {
        await trx.raw(
          `INSERT INTO regions (name, geom) VALUES (?, ST_Multi(ST_MakePolygon(ST_MakeLine(ARRAY[
             ST_MakePoint(?, ?), ST_MakePoint(?, ?), ST_MakePoint(?, ?), ST_MakePoint(?, ?)]))))`,
          [name, cx - r, cy - r / 3, cx + r / 2, cy - r, cx + r / 3, cy + r, cx - r, cy - r / 3],
        );
      }
      // 1. The hexagons current.
      await refreshReadingHexes(trx);
      expect(await trx('reading_hex_dirty').count('* as n').first()).toEqual({ n: '0' });
      expect(await expectExactCounts(trx)).toBeGreaterThan(2000);
      // The figures do come from the stored counts of hexagons inside the outlines (not only from the readings).
      await trx.raw('UPDATE reading_hexes SET readings = readings + 1000000');
      const inflated = (await listRegionCounts(trx, { seesCustomers: true })).find((r) => r.name === 'Cut large')!;
      expect(inflated.readings).toBeGreaterThan(1000000);
      await trx.raw('UPDATE reading_hexes SET readings = readings - 1000000');

      // 2. Readings added, moved and removed since the hexagons were recomputed.
      await trx.raw(
        `INSERT INTO readings (taken_at, geom, tech, rsrp_dbm, source)
         SELECT now(), ST_SetSRID(ST_MakePoint(? + (k % 17) * 0.003, ? + (k % 23) * 0.002), 4326), 'lte', -100, 'import'
           FROM generate_series(1, 300) k`,
        [cx - 0.02, cy - 0.02],
      );
      await trx.raw('UPDATE readings SET geom = ST_Translate(geom, 0.01, 0.005) WHERE id IN (SELECT id FROM readings ORDER BY id LIMIT 50)');
      await trx.raw('DELETE FROM readings WHERE id IN (SELECT id FROM readings ORDER BY id DESC LIMIT 40 OFFSET 400)');
      expect(Number((await trx('reading_hex_dirty').count('* as n').first())!.n)).toBeGreaterThan(0);
      await expectExactCounts(trx);

      // 3. Everything changed at once (a box of NULL): every reading counted directly.
      await trx('reading_hex_dirty').insert({ box: null });
      await expectExactCounts(trx);
    });
  });
});
