// Demo map: the invented island's basemap, three operators on the test network code (MCC 001), its
// masts and cells, drive-survey readings and service regions, all from the deterministic generator
// in src/lib/demo. Ids are fixed (operators 1–3, masts and cells numbered as generated) so that later
// seeds and tests can refer to them.
import type { Knex } from 'knex';
import { generateDemoScenario } from '../src/lib/demo';
import { CELL, MAST } from '../src/lib/schemas/masts';

const TABLES = ['readings', 'cells', 'masts', 'operators', 'regions', 'basemap_land', 'basemap_water', 'basemap_roads', 'basemap_places', 'basemap_landuse'];
const BATCH = 1000;

async function insertInBatches(knex: Knex, table: string, rows: Record<string, unknown>[]): Promise<void> {
  for (let i = 0; i < rows.length; i += BATCH) await knex(table).insert(rows.slice(i, i + BATCH));
}

/** Moves a table's id sequence past the explicit ids inserted by the seed. */
async function syncSequence(knex: Knex, table: string): Promise<void> {
  await knex.raw(`SELECT setval(pg_get_serial_sequence(?, 'id'), coalesce((SELECT max(id) FROM ${table}), 0) + 1, false)`, [table]);
}

export async function seed(knex: Knex): Promise<void> {
  await knex.raw(`TRUNCATE ${TABLES.join(', ')} RESTART IDENTITY CASCADE`);
  const scenario = generateDemoScenario();
  const point = (lon: number, lat: number) => knex.raw('ST_SetSRID(ST_MakePoint(?, ?), 4326)', [lon, lat]);
  const geometry = (g: unknown, multi = false) =>
    knex.raw(multi ? 'ST_Multi(ST_SetSRID(ST_GeomFromGeoJSON(?), 4326))' : 'ST_SetSRID(ST_GeomFromGeoJSON(?), 4326)', [JSON.stringify(g)]);
  const admin: { id: string } | undefined = await knex('users').where({ role: 'admin' }).orderBy('id').first('id');
  const actor = admin?.id ?? null;

  await knex('operators').insert(scenario.operators.map((o) => ({ id: o.id, name: o.name, mcc: o.mcc, mnc: o.mnc, colour: o.colour })));

  // Masts and cells as their record declarations write them (ids fixed, positions as points).
  await insertInBatches(
    knex,
    'masts',
    scenario.masts.map((m) => ({ id: m.id, ...MAST.insertRow({ ...m, source: 'demo' }), geom: point(m.lon, m.lat), created_by: actor, updated_by: actor })),
  );
  await insertInBatches(
    knex,
    'cells',
    scenario.cells.map((c) => ({ id: c.id, mast_id: c.mastId, ...CELL.insertRow(c) })),
  );

  await insertInBatches(
    knex,
    'readings',
    scenario.readings.map((r) => ({
      taken_at: r.takenAt,
      geom: point(r.lon, r.lat),
      tech: r.tech,
      channel: r.channel,
      pci: r.pci,
      rsrp_dbm: r.rsrpDbm,
      rsrq_db: r.rsrqDb,
      sinr_db: r.sinrDb,
      rssi_dbm: r.rssiDbm,
      cell_id: r.cellId,
      device: r.device,
      source: r.source,
    })),
  );

  await knex('regions').insert(scenario.regions.map((r) => ({ name: r.name, geom: geometry(r.geometry, true) })));

  const { land, water, roads, places, landuse } = scenario.basemap;
  await knex('basemap_land').insert(land.map((f) => ({ name: f.name, kind: f.kind, geom: geometry(f.geometry, true) })));
  await knex('basemap_water').insert(water.map((f) => ({ name: f.name, kind: f.kind, geom: geometry(f.geometry) })));
  await knex('basemap_roads').insert(roads.map((f) => ({ name: f.name, kind: f.kind, ref: f.ref, geom: geometry(f.geometry) })));
  await knex('basemap_places').insert(
    places.map((f) => ({
      name: f.name,
      kind: f.kind,
      rank: f.rank,
      population: f.population,
      ele_m: f.eleM,
      geom: point(f.geometry.coordinates[0]!, f.geometry.coordinates[1]!),
    })),
  );
  await insertInBatches(
    knex,
    'basemap_landuse',
    landuse.map((f) => ({ name: f.name, kind: f.kind, geom: geometry(f.geometry, true) })),
  );
  // Land cover stops at the coast and at the lake shores.
  await knex.raw(`
    UPDATE basemap_landuse u
       SET geom = ST_Multi(ST_CollectionExtract(ST_MakeValid(ST_Difference(
             ST_Intersection(u.geom, (SELECT ST_Union(geom) FROM basemap_land)),
             coalesce((SELECT ST_Union(geom) FROM basemap_water WHERE kind = 'lake'), 'SRID=4326;POLYGON EMPTY'::geometry))), 3))`);
  await knex('basemap_landuse').whereRaw('ST_IsEmpty(geom)').delete();

  for (const table of ['operators', 'masts', 'cells']) await syncSequence(knex, table);
}
