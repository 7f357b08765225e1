import { beforeAll, describe, expect, it } from 'vitest';
import { VectorTile } from '@mapbox/vector-tile';
import Pbf from 'pbf';
import { seed as seedUsers } from '../../seeds/01_demo_users';
import { seed as seedMap } from '../../seeds/02_demo_map';
import { generateDemoScenario, type DemoScenario } from '../../src/lib/demo';
import { listMasts, createMast } from '../../src/lib/server/repos/masts';
import { getBasemapTile, getMastsTile } from '../../src/lib/server/repos/tiles';
import { MastInputSchema } from '../../src/lib/schemas/masts';
import { testDb, truncateAll } from '../helpers/db';

let scenario: DemoScenario;

async function runSeeds() {
  const db = testDb();
  // As scripts/lib/seed-runner.ts runs them: in name order, each in its own transaction.
  await db.transaction((trx) => seedUsers(trx));
  await db.transaction((trx) => seedMap(trx));
}

const count = async (table: string) => Number((await testDb()(table).count<{ n: string }[]>('* as n'))[0]!.n);

/** XYZ tile of a position (OGC / Web Mercator tile scheme, common practice). */
function tileOf(lat: number, lon: number, z: number) {
  const n = 2 ** z;
  const phi = (lat * Math.PI) / 180;
  return { z, x: Math.floor(((lon + 180) / 360) * n), y: Math.floor(((1 - Math.log(Math.tan(phi) + 1 / Math.cos(phi)) / Math.PI) / 2) * n) };
}

beforeAll(async () => {
  await truncateAll();
  scenario = generateDemoScenario();
  await runSeeds();
}, 120_000);

describe('demo map seed', () => {
  it('loads the whole scenario with fixed ids', async () => {
    expect(await count('operators')).toBe(3);
    expect(await count('masts')).toBe(scenario.masts.length);
    expect(await count('cells')).toBe(scenario.cells.length);
    expect(await count('readings')).toBe(scenario.readings.length);
    expect(await count('regions')).toBe(scenario.regions.length);
    const ops = await testDb()('operators').orderBy('id').select('id', 'name', 'mcc', 'mnc', 'colour');
    expect(ops.map((o) => ({ ...o, id: Number(o.id) }))).toEqual(scenario.operators);
    for (const table of ['basemap_land', 'basemap_water', 'basemap_roads', 'basemap_places', 'basemap_landuse']) {
      expect(await count(table), table).toBeGreaterThan(0);
    }
  });

  it('keeps every mast on land and out of the lakes', async () => {
    const { rows } = await testDb().raw(`
      SELECT count(*) FILTER (WHERE NOT ST_Within(m.geom, l.geom)) AS at_sea,
             count(*) FILTER (WHERE EXISTS (SELECT 1 FROM basemap_water w WHERE w.kind = 'lake' AND ST_Within(m.geom, w.geom))) AS in_lake
        FROM masts m, basemap_land l`);
    expect(rows[0]).toEqual({ at_sea: '0', in_lake: '0' });
  });

  it('stores valid geometry; land cover is clipped to the coast', async () => {
    const { rows } = await testDb().raw(`
      SELECT (SELECT count(*) FROM regions WHERE NOT ST_IsValid(geom)) AS bad_regions,
             (SELECT count(*) FROM basemap_landuse WHERE NOT ST_IsValid(geom)) AS bad_landuse,
             (SELECT count(*) FROM basemap_landuse u, basemap_land l WHERE NOT ST_CoveredBy(u.geom, ST_Buffer(l.geom, 0.0001))) AS landuse_at_sea`);
    expect(rows[0]).toEqual({ bad_regions: '0', bad_landuse: '0', landuse_at_sea: '0' });
  });

  it('puts every active mast in exactly one region', async () => {
    const { rows } = await testDb().raw(`
      SELECT m.id, count(r.id)::int AS regions FROM masts m LEFT JOIN regions r ON ST_Within(m.geom, r.geom)
       WHERE m.status = 'active' GROUP BY m.id HAVING count(r.id) <> 1`);
    expect(rows).toEqual([]);
  });

  it('matches readings to cells with the same technology, channel and PCI', async () => {
    const { rows } = await testDb().raw(`
      SELECT count(*) AS mismatched FROM readings r JOIN cells c ON c.id = r.cell_id
       WHERE r.tech <> c.tech OR r.channel <> c.channel OR r.pci <> c.pci`);
    expect(rows[0].mismatched).toBe('0');
  });

  it('serves the island through the API and tiles', async () => {
    const db = testDb();
    const { bounds, centre } = scenario.island;
    const list = await listMasts(db, { bbox: { minLon: bounds.west, minLat: bounds.south, maxLon: bounds.east, maxLat: bounds.north }, limit: 100 });
    expect(list.items).toHaveLength(scenario.masts.length);
    const t = tileOf(centre.lat, centre.lon, 8);
    const basemap = new VectorTile(new Pbf(await getBasemapTile(db, t)));
    expect(Object.keys(basemap.layers).sort()).toEqual(['land', 'landuse', 'places', 'roads', 'water']);
    // Below the clustering zoom a square's masts share one feature; together they count every mast.
    const low = new VectorTile(new Pbf(await getMastsTile(db, t, {}))).layers;
    const singles = low.masts?.length ?? 0;
    let clustered = 0;
    for (let i = 0; i < (low.mast_clusters?.length ?? 0); i++) clustered += Number(low.mast_clusters!.feature(i).properties.point_count);
    expect(singles + clustered).toBe(scenario.masts.length);
    const masts = new VectorTile(new Pbf(await getMastsTile(db, tileOf(centre.lat, centre.lon, 12), {}))).layers.masts!;
    expect(masts.length).toBeGreaterThan(0);
    const sample = masts.feature(0).properties;
    expect(Object.keys(sample).sort()).toEqual(['bands', 'cell_count', 'id', 'name', 'op_count', 'op_ids', 'status', 'structure_type', 'techs']);
  });

  it('can run again: clears its own tables and keeps the ids and sequences in step', async () => {
    await runSeeds();
    expect(await count('masts')).toBe(scenario.masts.length);
    expect(await count('cells')).toBe(scenario.cells.length);
    const mast = await createMast(testDb(), MastInputSchema.parse({ name: 'After seed', lat: -47.2, lon: -128.4 }), null);
    expect(Number(mast.id)).toBe(scenario.masts.length + 1);
  }, 120_000);
});
