import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import type { APIContext } from 'astro';
import { VectorTile } from '@mapbox/vector-tile';
import Pbf from 'pbf';
import { GET as getTile } from '../../src/pages/api/tiles/[layer]/[z]/[x]/[y].mvt';
import { POST as importReadings } from '../../src/pages/api/readings/import';
import { stopJobQueue } from '../../src/lib/server/jobs/runtime';
import { createOperator } from '../../src/lib/server/repos/operators';
import { createMast } from '../../src/lib/server/repos/masts';
import { createCell } from '../../src/lib/server/repos/cells';
import { hasDirtyReadingHexes, hexCellSql, readingHexesQuery, refreshReadingHexes } from '../../src/lib/server/repos/reading-hexes';
import { getDataVersion } from '../../src/lib/server/data-version';
import { CellInputSchema, MastInputSchema } from '../../src/lib/schemas/masts';
import { HEX_LEVELS, fromWebMercator, getHexCell, getHexCentre, getHexLevel, toWebMercator } from '../../src/lib/domain/signal-map';
import type { SessionUser } from '../../src/lib/server/session-user';
import { testDb, truncateAll } from '../helpers/db';
import { asSessionUser, makeUser } from '../helpers/factories';
import { call } from '../helpers/endpoint';
import { buildReadingsFixture, csvUpload, readingCsv } from '../helpers/readings-fixture';

/** The XYZ tile holding a WGS84 position (OGC / Web Mercator tile scheme, common practice of web maps). */
function tileOf(lat: number, lon: number, z: number) {
  const n = 2 ** z;
  const phi = (lat * Math.PI) / 180;
  return { z, x: Math.floor(((lon + 180) / 360) * n), y: Math.floor(((1 - Math.log(Math.tan(phi) + 1 / Math.cos(phi)) / Math.PI) / 2) * n) };
}

async function fetchTile(t: { z: number | string; x: number | string; y: number | string }, opts: { user?: SessionUser | null; query?: string } = {}) {
  const url = new URL(`/api/tiles/signal/${t.z}/${t.x}/${t.y}.mvt${opts.query ? `?${opts.query}` : ''}`, 'http://127.0.0.1:4321');
  const ctx = {
    request: new Request(url),
    url,
    params: { layer: 'signal', z: String(t.z), x: String(t.x), y: String(t.y) },
    locals: { user: opts.user ?? null, session: null },
  } as unknown as APIContext;
  const res = await getTile(ctx);
  const bytes = new Uint8Array(await res.arrayBuffer());
  const json = res.headers.get('content-type')?.includes('json') ? JSON.parse(new TextDecoder().decode(bytes)) : null;
  return { status: res.status, headers: res.headers, bytes, json };
}

function features(bytes: Uint8Array) {
  const layer = new VectorTile(new Pbf(bytes)).layers.signal;
  return layer ? Array.from({ length: layer.length }, (_, i) => layer.feature(i)) : [];
}

const FINEST = HEX_LEVELS[HEX_LEVELS.length - 1]!;
/** The finest hexagon around (−47.2, −128.5), and a point `dx`, `dy` Web Mercator metres from its centre. */
const BASE = toWebMercator(-128.5, -47.2);
const BASE_CELL = getHexCell(FINEST.sizeM, BASE.x, BASE.y);
const CENTRE = getHexCentre(FINEST.sizeM, BASE_CELL.i, BASE_CELL.j);
const near = (dx: number, dy: number, centre = CENTRE) => fromWebMercator(centre.x + dx, centre.y + dy);
/** The centre of the finest hexagon `di` columns east of the base one (same row; west when negative). */
const otherCentre = (di: number) => getHexCentre(FINEST.sizeM, BASE_CELL.i + di, BASE_CELL.j);

interface ReadingValues {
  at: { lon: number; lat: number };
  rsrp: number | null;
  rsrq?: number | null;
  sinr?: number | null;
  cellId?: string | null;
  installCheckId?: number | null;
  minute?: number;
}

async function insertReadings(values: ReadingValues[]): Promise<void> {
  const db = testDb();
  await db('readings').insert(
    values.map((v, k) => ({
      taken_at: new Date(Date.UTC(2026, 10, 1, 9, v.minute ?? k)),
      geom: db.raw('ST_SetSRID(ST_MakePoint(?, ?), 4326)', [v.at.lon, v.at.lat]),
      tech: 'lte',
      channel: 6300,
      pci: 101,
      rsrp_dbm: v.rsrp,
      rsrq_db: v.rsrq ?? null,
      sinr_db: v.sinr ?? null,
      cell_id: v.cellId ?? null,
      install_check_id: v.installCheckId ?? null,
      source: v.installCheckId ? 'install_check' : 'survey',
    })),
  );
}

let ops: { a: string; b: string };
let cells: { aB20: string; aB3: string; bB20: string };
let users: Record<'contributor' | 'reviewer' | 'planner' | 'surveyor' | 'admin', SessionUser>;

async function buildNetwork() {
  const db = testDb();
  ops = {
    a: (await createOperator(db, { name: 'Test Mobile A', mcc: '001', mnc: '01' }, null)).id,
    b: (await createOperator(db, { name: 'Test Mobile B', mcc: '001', mnc: '02' }, null)).id,
  };
  const hill = (await createMast(db, MastInputSchema.parse({ name: 'Test Hill', lat: -47.21, lon: -128.49 }), null)).id;
  const cell = async (operatorId: string, channel: number, pci: number) =>
    (await createCell(db, hill, CellInputSchema.parse({ operator_id: operatorId, tech: 'lte', channel, pci }), null)).id;
  // 3GPP TS 36.101 Table 5.7.3-1: EARFCN 6300 is in band 20, 1300 in band 3.
  cells = { aB20: await cell(ops.a, 6300, 101), aB3: await cell(ops.a, 1300, 102), bB20: await cell(ops.b, 6300, 103) };
  users = {
    contributor: asSessionUser(await makeUser('contributor')),
    reviewer: asSessionUser(await makeUser('reviewer')),
    planner: asSessionUser(await makeUser('planner')),
    surveyor: asSessionUser(await makeUser('surveyor')),
    admin: asSessionUser(await makeUser('admin')),
  };
}

describe('the hexagon of a point', () => {
  beforeAll(truncateAll);

  it('is the PostGIS hexagon that holds it, in SQL and in TypeScript alike, at every level and around the world', async () => {
    const db = testDb();
    // Deterministic spread of positions (a fixed linear congruential sequence, common practice).
    let seed = 12345;
    const next = () => (seed = (seed * 1103515245 + 12345) % 2 ** 31) / 2 ** 31;
    const points = Array.from({ length: 400 }, () => ({ lon: -179 + 358 * next(), lat: -80 + 160 * next() }));
    for (const level of HEX_LEVELS) {
      const { rows } = await db.raw<{ rows: Array<{ k: number; i: number; j: number; inside: boolean }> }>(
        `SELECT p.k, h.i, h.j, ST_Intersects(ST_Transform(p.geom, 3857), ST_Hexagon(?, h.i, h.j, ST_SetSRID(ST_MakePoint(0, 0), 3857))) AS inside
           FROM (SELECT (v->>'k')::int AS k, ST_SetSRID(ST_MakePoint((v->>'lon')::float8, (v->>'lat')::float8), 4326) AS geom
                   FROM jsonb_array_elements(?::jsonb) v) p
           ${hexCellSql('h', 'p.geom', String(level.sizeM))}
          ORDER BY p.k`,
        [level.sizeM, JSON.stringify(points.map((p, k) => ({ k, ...p })))],
      );
      expect(rows).toHaveLength(points.length);
      for (const r of rows) {
        expect(r.inside, `level ${level.level} point ${r.k}`).toBe(true);
        const m = toWebMercator(points[r.k]!.lon, points[r.k]!.lat);
        expect(getHexCell(level.sizeM, m.x, m.y)).toEqual({ i: r.i, j: r.j });
      }
    }
  });
});

describe('signal hexagons', () => {
  beforeEach(async () => {
    await truncateAll();
    // Emptying readings marks everything for recomputation; start from a clean slate instead.
    await testDb()('reading_hex_dirty').delete();
    await buildNetwork();
  });

  it('hold the count and median of RSRP, RSRQ and SINR per operator and band, and over all of them', async () => {
    await insertReadings([
      // Operator A, B20: RSRP −70, −80, −90, −100 → median −85 (mean of the middle two);
      // RSRQ on three of them −8, −12, −20 → −12; SINR on one, 4 → 4.
      { at: near(-20, 10), rsrp: -70, rsrq: -8, sinr: 4, cellId: cells.aB20 },
      { at: near(15, -5), rsrp: -80, rsrq: -12, cellId: cells.aB20 },
      { at: near(0, 30), rsrp: -90, rsrq: -20, cellId: cells.aB20 },
      { at: near(-30, -25), rsrp: -100, cellId: cells.aB20 },
      // Operator A, B3: −95 → −95.
      { at: near(5, 5), rsrp: -95, rsrq: -15, cellId: cells.aB3 },
      // Operator B, B20: −60, −61, −110 → −61.
      { at: near(10, 0), rsrp: -60, cellId: cells.bB20 },
      { at: near(-10, 0), rsrp: -61, cellId: cells.bB20 },
      { at: near(0, -10), rsrp: -110, cellId: cells.bB20 },
      // Matched to no cell: counts only for every operator together.
      { at: near(0, 0), rsrp: -120, rsrq: -19 },
    ]);
    const result = await refreshReadingHexes(testDb());
    expect(result).toMatchObject({ areas: 1, everywhere: false });

    const db = testDb();
    const row = (operatorId: string | null, band: string | null) =>
      db('reading_hexes').where({ level: FINEST.level, audience: 'survey', i: BASE_CELL.i, j: BASE_CELL.j, operator_id: operatorId, band }).first();
    expect(await row(ops.a, 'B20')).toMatchObject({
      readings: 4,
      rsrp_count: 4,
      rsrp_median_dbm: -85,
      rsrq_count: 3,
      rsrq_median_db: -12,
      sinr_count: 1,
      sinr_median_db: 4,
    });
    expect(await row(ops.a, 'B3')).toMatchObject({ readings: 1, rsrp_median_dbm: -95, rsrq_median_db: -15, sinr_count: 0, sinr_median_db: null });
    // Operator A over both bands: −70, −80, −90, −95, −100 → −90.
    expect(await row(ops.a, null)).toMatchObject({ readings: 5, rsrp_median_dbm: -90, rsrq_count: 4, rsrq_median_db: -13.5 });
    expect(await row(ops.b, 'B20')).toMatchObject({ readings: 3, rsrp_median_dbm: -61, rsrq_count: 0 });
    // Everything, the unmatched reading too: −120, −110, −100, −95, −90, −80, −70, −61, −60 → −90.
    expect(await row(null, null)).toMatchObject({ readings: 9, rsrp_count: 9, rsrp_median_dbm: -90, rsrq_count: 5, rsrq_median_db: -15 });
    // Bands are kept per operator; no row for the unmatched reading under an unknown operator.
    expect(await db('reading_hexes').where({ level: FINEST.level }).whereNull('operator_id').whereNotNull('band').count('* as n').first()).toEqual({ n: '0' });
    expect(await db('reading_hexes').where({ level: FINEST.level }).whereNotNull('operator_id').whereNull('band').count('* as n').first()).toEqual({ n: '2' });
    expect(await hasDirtyReadingHexes(db)).toBe(false);

    // Every level counts each reading once, in exactly one hexagon.
    const perLevel = await db('reading_hexes').whereNull('operator_id').whereNull('band').groupBy('level').select('level', db.raw('sum(readings)::int AS n'));
    expect(perLevel.map((r: { level: number; n: number }) => [r.level, r.n]).sort()).toEqual(HEX_LEVELS.map((l) => [l.level, 9]));
  });

  it('are served as MVT polygons with counts and medians, filtered by operator and band', async () => {
    await insertReadings([
      { at: near(0, 0), rsrp: -70, rsrq: -9, sinr: 21, cellId: cells.aB20 },
      { at: near(5, 5), rsrp: -74, rsrq: -11, sinr: 15.5, cellId: cells.aB20 },
      { at: near(0, 0, otherCentre(-2)), rsrp: -104.25, cellId: cells.bB20 },
    ]);
    await refreshReadingHexes(testDb());
    const t = tileOf(-47.2, -128.5, 14);

    const all = await fetchTile(t, { user: users.contributor });
    expect(all.status).toBe(200);
    expect(all.headers.get('content-type')).toBe('application/vnd.mapbox-vector-tile');
    expect(all.headers.get('cache-control')).toBe('private, max-age=60');
    const fs = features(all.bytes);
    expect(fs).toHaveLength(2);
    expect(fs.every((f) => f.type === 3)).toBe(true);
    // A hexagon: one ring of six corners, closed (seven points).
    expect(fs[0]!.loadGeometry()[0]).toHaveLength(7);
    const props = fs.map((f) => f.properties).sort((a, b) => Number(b.rsrp_median_dbm) - Number(a.rsrp_median_dbm));
    expect(props[0]).toEqual({
      readings: 2,
      rsrp_count: 2,
      rsrp_median_dbm: -72,
      rsrq_count: 2,
      rsrq_median_db: -10,
      sinr_count: 2,
      sinr_median_db: 18.3, // (21 + 15.5) / 2 = 18.25, sent to 0.1 dB
    });
    expect(props[1]).toEqual({ readings: 1, rsrp_count: 1, rsrp_median_dbm: -104.3, rsrq_count: 0, sinr_count: 0 });

    const opB = features((await fetchTile(t, { user: users.contributor, query: `operator=${ops.b}` })).bytes);
    expect(opB.map((f) => f.properties.rsrp_median_dbm)).toEqual([-104.3]);
    const opAB3 = await fetchTile(t, { user: users.contributor, query: `operator=${ops.a}&band=B3` });
    expect(opAB3.status).toBe(204);
    const b20 = features((await fetchTile(t, { user: users.contributor, query: `operator=${ops.a}&band=B20` })).bytes);
    expect(b20.map((f) => f.properties.readings)).toEqual([2]);

    // Zoomed out, a coarser level: both readings' hexagons merge at level 1 (8 km).
    const coarse = features((await fetchTile(tileOf(-47.2, -128.5, 7), { user: users.contributor })).bytes);
    expect(coarse).toHaveLength(1);
    expect(coarse[0]!.properties).toMatchObject({ readings: 3, rsrp_median_dbm: -74 });
  });

  it('count readings from customers’ homes only for roles that may see customers', async () => {
    const home = otherCentre(-4);
    await insertReadings([
      { at: near(0, 0), rsrp: -80, cellId: cells.aB20 },
      { at: near(3, 3), rsrp: -90, cellId: cells.aB20 },
      // An install check at a home inside the same hexagon, and one at a home in a hexagon of its own.
      { at: near(-4, 2), rsrp: -60, cellId: cells.aB20, installCheckId: 7 },
      { at: near(0, 0, home), rsrp: -101, cellId: cells.aB20, installCheckId: 8 },
    ]);
    await refreshReadingHexes(testDb());
    const t = tileOf(-47.2, -128.5, 14);
    const seen = async (user: SessionUser) =>
      features((await fetchTile(t, { user })).bytes)
        .map((f) => [f.properties.readings, f.properties.rsrp_median_dbm])
        .sort();
    // Survey readings only: one hexagon, −80 and −90 → −85; the lone home's hexagon is not there at all.
    for (const role of ['contributor', 'reviewer'] as const) expect(await seen(users[role])).toEqual([[2, -85]]);
    // With the homes: −60, −80, −90 → −80, and the second home's hexagon.
    for (const role of ['planner', 'surveyor', 'admin'] as const)
      expect(await seen(users[role])).toEqual(
        [
          [1, -101],
          [3, -80],
        ].sort(),
      );

    // The same rule for the region page's export.
    const bbox = [-128.6, -47.3, -128.4, -47.1] as const;
    const survey = await readingHexesQuery(testDb(), { level: FINEST.level, bbox, operatorId: ops.a, band: 'B20', withHomeReadings: false });
    expect(survey.rows.map((r) => [r.readings, r.rsrp_median_dbm])).toEqual([[2, -85]]);
    const withHomes = await readingHexesQuery(testDb(), { level: FINEST.level, bbox, operatorId: ops.a, band: 'B20', withHomeReadings: true });
    expect(withHomes.rows.map((r) => r.readings).sort()).toEqual([1, 3]);
    const geometry = JSON.parse(withHomes.rows[0]!.geometry);
    expect(geometry.type).toBe('Polygon');
    expect(geometry.coordinates[0]).toHaveLength(7);
    expect(geometry.coordinates[0][0][0]).toBeCloseTo(-128.5, 1);
  });

  it('are listed for a region: those touching its outline, in column and row order', async () => {
    const db = testDb();
    const west = otherCentre(-4);
    await insertReadings([
      { at: near(0, 0), rsrp: -80, cellId: cells.aB20 },
      { at: near(0, 0, west), rsrp: -100, cellId: cells.aB20 },
    ]);
    await refreshReadingHexes(db);
    // A small square around the base hexagon's centre only (±30 m Web Mercator).
    const sw = near(-30, -30);
    const ne = near(30, 30);
    const ring = [
      [sw.lon, sw.lat],
      [ne.lon, sw.lat],
      [ne.lon, ne.lat],
      [sw.lon, ne.lat],
      [sw.lon, sw.lat],
    ];
    const [{ id: regionId }] = await db('regions')
      .insert({
        name: 'Test Square',
        geom: db.raw('ST_Multi(ST_SetSRID(ST_GeomFromGeoJSON(?), 4326))', [JSON.stringify({ type: 'Polygon', coordinates: [ring] })]),
      })
      .returning('id');
    const bbox = [-128.6, -47.3, -128.4, -47.1] as const;
    const query = { level: FINEST.level, bbox, operatorId: null, band: null, withHomeReadings: false };
    const everywhere = await readingHexesQuery(db, query);
    expect(everywhere.rows.map((r) => [r.i, r.j])).toEqual([
      [BASE_CELL.i - 4, BASE_CELL.j],
      [BASE_CELL.i, BASE_CELL.j],
    ]);
    const inRegion = await readingHexesQuery(db, { ...query, regionId: String(regionId) });
    expect(inRegion.rows.map((r) => [r.i, r.j, r.readings, r.rsrp_median_dbm])).toEqual([[BASE_CELL.i, BASE_CELL.j, 1, -80]]);
  });

  it('are recomputed where readings changed, and a new data version makes the tile cache answer afresh', async () => {
    const db = testDb();
    await insertReadings([{ at: near(0, 0), rsrp: -80, cellId: cells.aB20 }]);
    await refreshReadingHexes(db);
    const t = tileOf(-47.2, -128.5, 14);
    const median = async () => features((await fetchTile(t, { user: users.contributor })).bytes).map((f) => f.properties.rsrp_median_dbm);
    expect(await median()).toEqual([-80]);
    const v1 = await getDataVersion(db, 'signal');

    // Stored model residuals are no change to the map.
    await db('readings').update({ model_residual_db: 1.5, residual_basis: 'test' });
    expect(await hasDirtyReadingHexes(db)).toBe(false);

    await insertReadings([{ at: near(5, 0), rsrp: -90, cellId: cells.aB20 }]);
    expect(await hasDirtyReadingHexes(db)).toBe(true);
    expect(await median()).toEqual([-80]); // not recomputed yet
    await refreshReadingHexes(db);
    expect(await getDataVersion(db, 'signal')).not.toBe(v1);
    expect(await median()).toEqual([-85]);

    // A deleted reading and a changed value are changes too.
    await db('readings').where({ rsrp_dbm: -80 }).delete();
    await db('readings').where({ rsrp_dbm: -90 }).update({ rsrp_dbm: -95 });
    await refreshReadingHexes(db);
    expect(await median()).toEqual([-95]);

    // A cell moved to another operator moves its readings' hexagons with it.
    await db('cells').where({ id: cells.aB20 }).update({ operator_id: ops.b });
    expect(await hasDirtyReadingHexes(db)).toBe(true);
    await refreshReadingHexes(db);
    expect((await fetchTile(t, { user: users.contributor, query: `operator=${ops.a}` })).status).toBe(204);
    expect(features((await fetchTile(t, { user: users.contributor, query: `operator=${ops.b}` })).bytes)).toHaveLength(1);

    // Far-away changes leave other hexagons alone: a reading 50 km east is recomputed on its own.
    const before = await db('reading_hexes').where({ level: FINEST.level }).select('i', 'j', 'readings');
    await insertReadings([{ at: { lon: -127.8, lat: -47.2 }, rsrp: -70 }]);
    const r = await refreshReadingHexes(db);
    expect(r).toMatchObject({ areas: 1, everywhere: false });
    const after = await db('reading_hexes').where({ level: FINEST.level }).select('i', 'j', 'readings');
    expect(after).toHaveLength(before.length + 1);
    expect(after).toEqual(expect.arrayContaining(before));
  });

  it('answer 401 signed out and 400 with fields for bad parameters', async () => {
    const t = tileOf(-47.2, -128.5, 12);
    expect((await fetchTile(t)).status).toBe(401);
    const bad = [
      ['operator=abc', 'operator'],
      ['operator=0', 'operator'],
      ['band=B99', 'band'],
      ['band=20', 'band'],
      ['band=%00', 'band'],
      ['band=B20', 'band'], // a band is one operator's
    ] as const;
    for (const [query, field] of bad) {
      const res = await fetchTile(t, { user: users.contributor, query });
      expect(res.status, query).toBe(400);
      expect(res.json.error.code).toBe('BAD_REQUEST');
      expect(Object.keys(res.json.error.fields), query).toEqual([field]);
    }
    const outside = await fetchTile({ z: 3, x: 8, y: 0 }, { user: users.contributor });
    expect(outside.status).toBe(400);
    expect(outside.json.error.fields.x).toEqual(['x must be 0–7 at zoom 3']);
    expect((await fetchTile({ z: 'a', x: 0, y: 0 }, { user: users.contributor })).status).toBe(400);
    // Empty filters mean "all".
    expect((await fetchTile(t, { user: users.contributor, query: 'operator=&band=' })).status).toBe(204);
  });
});

describe('the signal-hexes job', () => {
  beforeEach(async () => {
    await truncateAll();
  });
  afterAll(stopJobQueue);

  it('recomputes the hexagons after a readings import', async () => {
    const f = await buildReadingsFixture();
    const surveyor = asSessionUser(await makeUser('surveyor'));
    const db = testDb();
    const res = await call(importReadings, { user: surveyor, ...csvUpload(readingCsv(300)) });
    expect(res.status).toBe(202);
    // Nothing is computed by the test itself: the import job asks for the signal-hexes job, which runs.
    let rows: Array<{ readings: number }> = [];
    let pending = true;
    for (let k = 0; k < 240 && (pending || rows.length === 0); k++) {
      await new Promise((r) => setTimeout(r, 250));
      pending = await hasDirtyReadingHexes(db);
      rows = await db('reading_hexes').where({ level: 0, audience: 'survey', operator_id: f.opA }).whereNull('band').select('readings');
    }
    // The fixture's 300 readings lie within 2 km of one mast (a 32 km hexagon at the coarsest level), all matched to operator A.
    expect(getHexLevel(0).sizeM).toBe(32_000);
    expect(rows).toEqual([{ readings: 300 }]);
    expect(pending).toBe(false);
  });
});
