import { beforeAll, describe, expect, it } from 'vitest';
import { GET as shortlist } from '../../src/pages/api/shortlist/index';
import { importElevationFile } from '../../src/lib/server/elevation-import';
import { refreshResiduals } from '../../src/lib/server/residual-job';
import { config } from '../../src/lib/server/config';
import { getDestination } from '../../src/lib/domain/geodesy';
import { call } from '../helpers/endpoint';
import { testDb, truncateAll } from '../helpers/db';
import { asSessionUser, makeUser } from '../helpers/factories';
import { heightTiff } from '../../src/lib/demo/height-tiff';
import { insertB20Cell, insertMast } from '../helpers/shortlist-fixture';
import type { SessionUser } from '../../src/lib/server/session-user';

// Invented fixture: customer on flat 100 m ground; a 180 m ridge 3 km north of it; one mast 6 km
// north behind the ridge, one 11 km east over clear ground. Readings on both sides of the ridge, so
// some residuals carry a diffraction loss from the terrain and some do not.
const customer = { lat: -45.1, lon: -126.4 };
const north = getDestination(customer, 6000, 0);
const east = getDestination(customer, 11_000, 90);
const ridgeLat = getDestination(customer, 3000, 0).lat;
const WEST = customer.lon - 0.2;
const NORTH = customer.lat + 0.15;
const STEP = 0.001;
const W = 401;
const H = 301;

const fixtureTiff = () =>
  heightTiff({ west: WEST, north: NORTH, step: STEP, width: W, height: H }, (lat, lon) =>
    Math.abs(lat - ridgeLat) < 0.0025 && Math.abs(lon - customer.lon) < 0.03 ? 180 : 100,
  );

const ids: Record<string, string> = {};
let planner: SessionUser;

beforeAll(async () => {
  await truncateAll();
  planner = asSessionUser(await makeUser('planner'));
  const db = testDb();
  const [op] = await db('operators').insert({ name: 'Test op', mcc: '001', mnc: '01', colour: '#336699' }).returning('id');
  const mast = (name: string, p: { lat: number; lon: number }) => insertMast(db, name, p);
  const cell = (mastId: string, azimuth: number, pci: number) => insertB20Cell(db, mastId, String(op.id), { azimuthDeg: azimuth, heightM: 30, pci });
  ids.north = await cell(await mast('North hill', north), 180, 11);
  ids.east = await cell(await mast('East farm', east), 270, 22);
  const gain = JSON.stringify([
    { freq_mhz: 700, gain_dbi: 8 },
    { freq_mhz: 2700, gain_dbi: 8 },
  ]);
  ids.panel = String(
    (await db('antennas').insert({ name: 'Test panel', kind: 'directional', ports: 2, horizontal_beamwidth_deg: 40, gain_table: gain }).returning('id'))[0].id,
  );
  await importElevationFile(db, { fileName: 'fixture.tif', bytes: fixtureTiff() }, { dataDir: config.dataDir, actorId: null });
  // Ten readings of each cell scattered 0.5–4.5 km around the customer (some behind the ridge).
  const readings = [];
  for (const cellId of [ids.north, ids.east]) {
    for (let i = 0; i < 10; i++) {
      const p = getDestination(customer, 500 + i * 400, (i * 73) % 360);
      readings.push({
        taken_at: new Date(),
        geom: db.raw('ST_SetSRID(ST_MakePoint(?, ?), 4326)', [p.lon, p.lat]),
        tech: 'lte',
        channel: 6300,
        pci: cellId === ids.north ? 11 : 22,
        rsrp_dbm: -80 - i * 1.7,
        cell_id: cellId,
        source: 'test',
      });
    }
  }
  await db('readings').insert(readings);
});

const ask = async () => {
  const res = await call(shortlist, {
    url: `/api/shortlist?lat=${customer.lat}&lon=${customer.lon}&height_m=10&antenna_id=${ids.panel}&date=2026-06-01`,
    user: planner,
  });
  expect(res.status).toBe(200);
  return res.body.items as Array<{ cell_id: string; predicted_rsrp_dbm: number; calibration: { residual_db: number; readings_used: number } | null }>;
};
const calibrationOf = (items: Awaited<ReturnType<typeof ask>>, cellId: string) => items.find((i) => i.cell_id === cellId)!.calibration!;
const pending = async () => Number((await testDb()('readings').whereNull('residual_basis').count<{ count: string }[]>('* as count'))[0]!.count);

describe('stored model residuals', () => {
  it('give the same calibration as computing every reading on request (within 1e-9 dB)', async () => {
    const computed = await ask();
    expect(calibrationOf(computed, ids.north).readings_used).toBe(10);
    expect(await pending()).toBe(20);
    expect(await refreshResiduals(testDb(), { dataDir: config.dataDir, batchSize: 7 })).toBe(20);
    expect(await pending()).toBe(0);
    const stored = await ask();
    for (const cellId of [ids.north, ids.east]) {
      expect(Math.abs(calibrationOf(stored, cellId).residual_db - calibrationOf(computed, cellId).residual_db)).toBeLessThan(1e-9);
    }
    expect(stored.map((i) => i.predicted_rsrp_dbm)).toEqual(computed.map((i) => i.predicted_rsrp_dbm));
    // The ridge shows: readings behind it carry a diffraction loss, so residuals differ by cell.
    expect(calibrationOf(stored, ids.north).residual_db).not.toBeCloseTo(calibrationOf(stored, ids.east).residual_db, 0);
  });

  it('are what the shortlist reads once stored', async () => {
    const db = testDb();
    const before = calibrationOf(await ask(), ids.east).residual_db;
    await db('readings')
      .where({ cell_id: ids.east })
      .update({ model_residual_db: db.raw('model_residual_db + 10') });
    const after = calibrationOf(await ask(), ids.east).residual_db;
    expect(after).toBeGreaterThan(before);
    await db('readings')
      .where({ cell_id: ids.east })
      .update({ model_residual_db: db.raw('model_residual_db - 10') });
  });

  it('are cleared when the reading, its cell or its mast changes, and stale when the elevation data changes', async () => {
    const db = testDb();
    const first = await db('readings').where({ cell_id: ids.north }).orderBy('id').first('id');
    await db('readings').where({ id: first.id }).update({ rsrp_dbm: -70 });
    expect(await pending()).toBe(1);
    await db('cells').where({ id: ids.east }).update({ rs_power_dbm: 18 });
    expect(await pending()).toBe(11);
    expect(await refreshResiduals(testDb(), { dataDir: config.dataDir })).toBe(11);
    await db('masts')
      .whereIn('id', db('cells').select('mast_id').where({ id: ids.north }))
      .update({ structure_height_m: 50 });
    expect(await pending()).toBe(10);
    expect(await refreshResiduals(testDb(), { dataDir: config.dataDir })).toBe(10);
    // New elevation data: every stored residual's basis is out of date, so the shortlist computes
    // them again (same answer as before the data changed here, since the terrain is the same).
    const stored = await ask();
    await db('elevation_grids').update({ name: db.raw("name || ' (renamed)'") });
    const recomputed = await ask();
    expect(recomputed.map((i) => i.calibration?.residual_db)).toEqual(stored.map((i) => i.calibration?.residual_db));
    expect(await refreshResiduals(testDb(), { dataDir: config.dataDir })).toBe(20);
  });
});
