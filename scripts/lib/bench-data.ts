// The synthetic national data set for `npm run bench`, generated inside PostgreSQL (generate_series,
// seeded random()) so a full-size load takes minutes, not hours. Everything is invented: a fictional
// country of 200 towns in the South Pacific, four MCC 001 operators, masts clustered around the towns
// plus a rural spread, 5 cells per mast, 20 readings per cell and a gazetteer of addresses.
import type { Knex } from 'knex';
import { importElevationFile } from '../../src/lib/server/elevation-import';
import { heightTiff } from '../../src/lib/demo/height-tiff';
import { seed as seedUsers } from '../../seeds/01_demo_users';
import { seed as seedCatalogue } from '../../seeds/05_demo_catalogue';

/**
 * The national scale: 100k masts, 5 cells each, 10M readings and 1M addresses. 10M readings over 500k
 * cells is 20 readings per cell (100 per cell would be 50M: the total is what the targets were set at).
 */
export const FULL = { masts: 100_000, cellsPerMast: 5, readingsPerCell: 20, addresses: 1_000_000 };
/** The country's box (west, south, east, north): open ocean on real maps. */
export const COUNTRY = [-128, -48, -118, -40] as const;
export const TOWN_COUNT = 200;
/** The elevation grid covers 1° around town 1, where the shortlist is measured. */
export const GRID_SPAN_DEG = 1;
const GRID_STEP_DEG = 1 / 1200; // 3 arc-seconds

export interface BenchCounts {
  masts: number;
  cells: number;
  readings: number;
  addresses: number;
}

export function targetCounts(scale: number): BenchCounts {
  const masts = Math.max(200, Math.round(FULL.masts * scale));
  return {
    masts,
    cells: masts * FULL.cellsPerMast,
    readings: masts * FULL.cellsPerMast * FULL.readingsPerCell,
    addresses: Math.max(1000, Math.round(FULL.addresses * scale)),
  };
}

export async function currentCounts(db: Knex): Promise<BenchCounts> {
  const one = async (t: string) => Number((await db.raw(`SELECT count(*) AS n FROM ${t}`)).rows[0].n);
  return { masts: await one('masts'), cells: await one('cells'), readings: await one('readings'), addresses: await one('addresses') };
}

const TOWNS_SQL = `
  SELECT i AS id,
    (ARRAY['Kel','Dun','Bar','Tor','Mor','Ard','Glen','Pen','Tre','Aber'])[1 + (i - 1) % 10] ||
    (ARRAY['varrow','mere','stead','holm','wick','by','ford','ton','ness','combe','ley','wyn','moor','dale','thorpe','haven','field','burgh','cott','well'])[1 + ((i - 1) / 10) % 20] AS name,
    ${COUNTRY[0]} + 0.5 + ((i * 7919) % 1000) / 1000.0 * ${COUNTRY[2] - COUNTRY[0] - 1} AS lon,
    ${COUNTRY[1]} + 0.5 + ((i * 104729) % 997) / 997.0 * ${COUNTRY[3] - COUNTRY[1] - 1} AS lat
  FROM generate_series(1, ${TOWN_COUNT}) i`;

/** Town 1's position: the shortlist and the elevation grid are centred there. */
export async function townOne(db: Knex): Promise<{ lat: number; lon: number; name: string }> {
  const { rows } = await db.raw(`SELECT lat, lon, name FROM (${TOWNS_SQL}) t WHERE id = 1`);
  return { lat: Number(rows[0].lat), lon: Number(rows[0].lon), name: rows[0].name };
}

async function timed(label: string, fn: () => Promise<unknown>, log: (m: string) => void): Promise<void> {
  const t0 = Date.now();
  await fn();
  log(`${label} in ${((Date.now() - t0) / 1000).toFixed(1)} s`);
}

/** Loads indexes-off then rebuilds them: the way a bulk load is done. */
async function withoutIndexes(db: Knex, table: string, fn: () => Promise<void>, log?: (m: string) => void): Promise<void> {
  const { rows } = await db.raw<{ rows: Array<{ indexname: string; indexdef: string }> }>(
    `SELECT i.indexname, i.indexdef FROM pg_indexes i
      WHERE i.tablename = ? AND NOT EXISTS (SELECT 1 FROM pg_constraint c WHERE c.conname = i.indexname)`,
    [table],
  );
  for (const r of rows) await db.raw(`DROP INDEX ${r.indexname}`);
  await fn();
  await db.raw("SET maintenance_work_mem = '256MB'");
  for (const r of rows) {
    const t0 = Date.now();
    await db.raw(r.indexdef);
    log?.(`  index ${r.indexname} rebuilt in ${((Date.now() - t0) / 1000).toFixed(1)} s`);
  }
}

export async function generate(db: Knex, scale: number, dataDir: string, log: (m: string) => void): Promise<void> {
  const n = targetCounts(scale);
  await db.raw('TRUNCATE masts, cells, readings, addresses, operators, elevation_grids RESTART IDENTITY CASCADE');
  await seedUsers(db);
  await seedCatalogue(db);
  await db('operators').insert([
    { name: 'Bench Mobile North', mcc: '001', mnc: '01', colour: '#1f77b4' },
    { name: 'Bench Mobile South', mcc: '001', mnc: '02', colour: '#d62728' },
    { name: 'Bench Mobile East', mcc: '001', mnc: '03', colour: '#2ca02c' },
    { name: 'Bench Mobile West', mcc: '001', mnc: '04', colour: '#9467bd' },
  ]);
  await db.raw('SELECT setseed(0.42)');
  await timed(
    `${n.masts} masts`,
    () =>
      db.raw(
        `
      INSERT INTO masts (name, reference, geom, ground_elevation_m, structure_height_m, structure_type, status, source)
      SELECT 'Bench mast ' || i, 'BM-' || i,
        ST_SetSRID(ST_MakePoint(
          CASE WHEN i % 10 < 7 THEN t.lon + (random() + random() + random() - 1.5) * 0.12 ELSE ${COUNTRY[0]} + random() * ${COUNTRY[2] - COUNTRY[0]} END,
          CASE WHEN i % 10 < 7 THEN t.lat + (random() + random() + random() - 1.5) * 0.09 ELSE ${COUNTRY[1]} + random() * ${COUNTRY[3] - COUNTRY[1]} END), 4326),
        100 + random() * 150, 20 + random() * 30,
        (ARRAY['lattice_tower','monopole','guyed_mast','rooftop','pole'])[1 + i % 5],
        CASE WHEN i % 50 = 0 THEN 'planned' WHEN i % 97 = 0 THEN 'decommissioned' ELSE 'active' END, 'bench'
      FROM generate_series(1, ?) i JOIN (${TOWNS_SQL}) t ON t.id = 1 + (i * 31) % ${TOWN_COUNT}`,
        [n.masts],
      ),
    log,
  );
  await timed(
    `${n.cells} cells (mast summaries by trigger)`,
    () =>
      db.raw(`
      INSERT INTO cells (mast_id, operator_id, tech, band, channel, dl_mhz, pci, sector_azimuth_deg, antenna_height_m)
      SELECT m.id, 1 + (m.id + g.k) % 4, b.tech, b.band, b.channel, b.dl, (m.id * 5 + g.k) % 504, (g.k * 72) % 360, 20 + g.k * 2
      FROM masts m CROSS JOIN generate_series(0, ${FULL.cellsPerMast - 1}) AS g(k)
      JOIN (VALUES (0, 'lte', 'B20', 6300, 806.0), (1, 'lte', 'B3', 1300, 1815.0), (2, 'lte', 'B7', 3100, 2655.0),
                   (3, 'nr', 'n78', 641280, 3619.2), (4, 'lte', 'B1', 100, 2120.0)) b(bk, tech, band, channel, dl) ON b.bk = g.k`),
    log,
  );
  await timed(
    `${n.readings} readings (indexes rebuilt after)`,
    () =>
      withoutIndexes(
        db,
        'readings',
        async () => {
          const { rows } = await db.raw('SELECT min(id) AS lo, max(id) AS hi FROM cells');
          const step = 20_000;
          for (let lo = Number(rows[0].lo); lo <= Number(rows[0].hi); lo += step) {
            await db.raw(
              `INSERT INTO readings (taken_at, geom, tech, channel, pci, rsrp_dbm, rsrq_db, sinr_db, cell_id, device, source)
           SELECT now() - random() * interval '365 days',
             ST_SetSRID(ST_MakePoint(ST_X(m.geom) + (random() - 0.5) * 0.08, ST_Y(m.geom) + (random() - 0.5) * 0.06), 4326),
             c.tech, c.channel, c.pci, -125 + random() * 55, -15 + random() * 10, -3 + random() * 25, c.id, 'bench phone', 'bench'
           FROM cells c JOIN masts m ON m.id = c.mast_id CROSS JOIN generate_series(1, ${FULL.readingsPerCell})
           WHERE c.id BETWEEN ? AND ?`,
              [lo, lo + step - 1],
            );
          }
        },
        log,
      ),
    log,
  );
  await timed(
    `${n.addresses} addresses`,
    () =>
      withoutIndexes(
        db,
        'addresses',
        async () => {
          await db.raw(
            `INSERT INTO addresses (label, postcode, geom, source)
         SELECT (1 + i % 200) || ' ' ||
           (ARRAY['Mill','Crake','Harrow','Fen','Brook','Ash','Kiln','Tanner','Marsh','Holt','Wick','Thorn','Stone','Bramble','Corrie','Lark','Heron','Otter','Birch','Rowan'])[1 + (i / 200) % 20] || ' ' ||
           (ARRAY['Lane','Road','Street','Close','Way','Row','Drove','Hill'])[1 + (i / 4000) % 8] || ', ' || t.name,
           upper(substr(t.name, 1, 2)) || (1 + (i / 200) % 9) || ' ' || (i % 10) || chr(65 + (i / 7) % 26) || chr(65 + (i / 11) % 26),
           ST_SetSRID(ST_MakePoint(t.lon + (random() - 0.5) * 0.1, t.lat + (random() - 0.5) * 0.07), 4326), 'bench'
         FROM generate_series(0, ? - 1) i JOIN (${TOWNS_SQL}) t ON t.id = 1 + (i / 32000) % ${TOWN_COUNT}`,
            [n.addresses],
          );
        },
        log,
      ),
    log,
  );
  await timed('elevation grid around town 1', () => importGrid(db, dataDir), log);
  await timed('ANALYZE', () => db.raw('ANALYZE'), log);
}

/** A rolling synthetic terrain (hills 80–600 m) over GRID_SPAN_DEG around town 1, 3″ spacing. */
async function importGrid(db: Knex, dataDir: string): Promise<void> {
  const c = await townOne(db);
  const size = Math.round(GRID_SPAN_DEG / GRID_STEP_DEG);
  const west = c.lon - GRID_SPAN_DEG / 2;
  const north = c.lat + GRID_SPAN_DEG / 2;
  const bytes = heightTiff(
    { west, north, step: GRID_STEP_DEG, width: size, height: size },
    (_lat, _lon, k, r) => 300 + 180 * Math.sin(r / 97) * Math.cos(k / 131) + 90 * Math.sin((r + k) / 41) + 40 * Math.cos((r - 2 * k) / 17),
  );
  await importElevationFile(db, { fileName: 'bench-terrain.tif', bytes }, { dataDir, actorId: null });
}
