import { beforeAll, describe, expect, it } from 'vitest';
import { GET as shortlist } from '../../src/pages/api/shortlist/index';
import { importElevationFile } from '../../src/lib/server/elevation-import';
import { config } from '../../src/lib/server/config';
import { getDestination } from '../../src/lib/domain/geodesy';
import { call } from '../helpers/endpoint';
import { testDb, truncateAll } from '../helpers/db';
import { asSessionUser, makeUser } from '../helpers/factories';
import { heightTiff } from '../../src/lib/demo/height-tiff';
import { insertB20Cell, insertMast } from '../helpers/shortlist-fixture';
import type { SessionUser } from '../../src/lib/server/session-user';

// Hand-built fixture (invented): customer on flat ground at 100 m; mast N 6 km due north behind a
// 180 m ridge 3 km out; mast E 11 km due east over clear ground; a third mast 50 km away (outside
// the 35 km radius) and a decommissioned one next door (never a candidate).
const customer = { lat: -47.2, lon: -128.5 };
const north = getDestination(customer, 6000, 0);
const east = getDestination(customer, 11_000, 90);
const far = getDestination(customer, 50_000, 200);
const near = getDestination(customer, 800, 45);
const ridgeLat = getDestination(customer, 3000, 0).lat;

const WEST = -128.7;
const NORTH = -47.05;
const STEP = 0.001;
const W = 401;
const H = 301;

const fixtureTiff = () =>
  heightTiff({ west: WEST, north: NORTH, step: STEP, width: W, height: H }, (lat, lon) =>
    Math.abs(lat - ridgeLat) < 0.0025 && lon > -128.53 && lon < -128.47 ? 180 : 100,
  );

const ids: Record<string, string> = {};
let planner: SessionUser;

const mast = (name: string, p: { lat: number; lon: number }, status = 'active') => insertMast(testDb(), name, p, { structure_type: 'lattice_tower', status });
const cell = (mastId: string, operatorId: string, azimuth: number, height: number, pci: number) =>
  insertB20Cell(testDb(), mastId, operatorId, { azimuthDeg: azimuth, heightM: height, pci });

beforeAll(async () => {
  await truncateAll();
  planner = asSessionUser(await makeUser('planner'));
  const db = testDb();
  const [op1] = await db('operators').insert({ name: 'Test op one', mcc: '001', mnc: '01', colour: '#336699' }).returning('id');
  const [op2] = await db('operators').insert({ name: 'Test op two', mcc: '001', mnc: '02', colour: '#993366' }).returning('id');
  ids.op1 = String(op1.id);
  ids.op2 = String(op2.id);
  ids.north = await cell(await mast('North hill', north), ids.op1, 180, 30, 11);
  ids.east = await cell(await mast('East farm', east), ids.op2, 270, 45, 22);
  ids.far = await cell(await mast('Far away', far), ids.op1, 20, 30, 33);
  ids.dead = await cell(await mast('Old pole', near, 'decommissioned'), ids.op1, 225, 20, 44);
  const gain = (g: number) =>
    JSON.stringify([
      { freq_mhz: 700, gain_dbi: g },
      { freq_mhz: 2700, gain_dbi: g },
    ]);
  const [panel] = await db('antennas')
    .insert({ name: 'Test panel', kind: 'directional', ports: 2, horizontal_beamwidth_deg: 40, gain_table: gain(8) })
    .returning('id');
  await db('antennas').insert({ name: 'Test stub', kind: 'stub', ports: 1, horizontal_beamwidth_deg: 360, gain_table: gain(2) });
  const [cable] = await db('cables')
    .insert({
      name: 'Test cable',
      loss_table: JSON.stringify([
        { freq_mhz: 700, loss_db_per_m: 0.35 },
        { freq_mhz: 2700, loss_db_per_m: 0.35 },
      ]),
      connector_loss_db: 0.15,
      connectors: 2,
    })
    .returning('id');
  ids.panel = String(panel.id);
  ids.cable = String(cable.id);
  await importElevationFile(db, { fileName: 'fixture.tif', bytes: fixtureTiff() }, { dataDir: config.dataDir, actorId: null });
});

const ask = (qs: string, user: SessionUser | null = planner) => call(shortlist, { url: `/api/shortlist?${qs}`, user });
const base = () => `lat=${customer.lat}&lon=${customer.lon}&height_m=10&antenna_id=${ids.panel}&cable_id=${ids.cable}&cable_m=10&date=2026-06-01`;

describe('GET /api/shortlist', () => {
  it('answers 401 when signed out', async () => {
    expect((await ask(base(), null)).status).toBe(401);
  });

  it('ranks the farther clear mast above the nearer one behind the ridge', async () => {
    const res = await ask(base());
    expect(res.status).toBe(200);
    expect(res.body.items.map((i: { cell_id: string }) => i.cell_id)).toEqual([ids.east, ids.north]);
    const [e, n] = res.body.items;
    expect(n.terrain.status).toBe('obstructed');
    expect(n.terrain.diffraction_loss_db).toBeGreaterThan(10);
    expect(Math.abs(n.terrain.worst_distance_m - 3000)).toBeLessThan(200);
    expect(e.terrain.status).toBe('clear');
    expect(res.body.customer_ground_m).toBeCloseTo(100, 0);
  });

  it('gives each candidate its figures with units in the names', async () => {
    const res = await ask(base());
    const n = res.body.items.find((i: { cell_id: string }) => i.cell_id === ids.north);
    expect(n.distance_m).toBeCloseTo(6000, -1);
    expect(n.bearing_true_deg).toBeCloseTo(0, 1);
    expect(n.bearing_from_mast_deg).toBeCloseTo(180, 1);
    expect(n.sector_offset_deg).toBeCloseTo(0, 0);
    // Declination at the customer from WMM2025 (geomagnetism package), magnetic = true − D (WMM sign convention)
    expect(n.bearing_magnetic_deg).toBeCloseTo((((n.bearing_true_deg - n.declination_deg) % 360) + 360) % 360, 1);
    // Both ends on 100 m ground: 10 m mount to a 30 m mast over 6 km, k = 4/3 (spherical geometry, effective radius k·R)
    expect(n.elevation_deg).toBeCloseTo((Math.atan(20 / 6000) * 180) / Math.PI - (6000 / (2 * (4 / 3) * 6371008.8)) * (180 / Math.PI), 2);
    expect(n.expected_gain_db).toBeCloseTo(8 - 3.5 - 0.3 - 2, 1);
    expect(n.budget.reduce((s: number, t: { db: number }) => s + t.db, 0)).toBeCloseTo(n.predicted_rsrp_dbm, 0);
    expect(n.calibration).toBeNull();
    expect(['excellent', 'good', 'fair', 'poor', 'unusable']).toContain(n.grade);
  });

  it('leaves out masts beyond the radius and decommissioned masts', async () => {
    const res = await ask(base());
    const cells = res.body.items.map((i: { cell_id: string }) => i.cell_id);
    expect(cells).not.toContain(ids.far);
    expect(cells).not.toContain(ids.dead);
    const wide = await ask(`${base()}&radius_m=60000`);
    expect(wide.body.items.map((i: { cell_id: string }) => i.cell_id)).toContain(ids.far);
  });

  it('moves a preferred operator up the ranking', async () => {
    const res = await ask(`${base()}&operator=${ids.op1}`);
    const gap = res.body.items[0].cell_id === ids.north;
    const plain = await ask(base());
    const diff = plain.body.items[0].predicted_rsrp_dbm - plain.body.items[1].predicted_rsrp_dbm;
    // The preference is a fixed bonus (6 dB, common practice): it wins only when the gap is smaller.
    expect(gap).toBe(diff < 6);
  });

  it('shifts a cell toward the median residual of its nearby readings, shrunk by their number', async () => {
    const before = (await ask(base())).body.items.find((i: { cell_id: string }) => i.cell_id === ids.east);
    const db = testDb();
    // Readings 1 km west of the customer, reported 12 dB stronger than any model would say.
    const at = getDestination(customer, 1000, 270);
    const modelled = before.predicted_rsrp_dbm;
    await db('readings').insert(
      [0, 1, 2].map((i) => ({
        taken_at: new Date(),
        geom: db.raw('ST_SetSRID(ST_MakePoint(?, ?), 4326)', [at.lon + i * 0.0001, at.lat]),
        tech: 'lte',
        channel: 6300,
        pci: 22,
        rsrp_dbm: modelled + 40,
        cell_id: ids.east,
        source: 'test',
      })),
    );
    const after = (await ask(base())).body.items.find((i: { cell_id: string }) => i.cell_id === ids.east);
    expect(after.calibration.readings_used).toBe(3);
    expect(after.calibration.residual_db).toBeGreaterThan(0);
    // Three readings agreeing within 3 dB: w = 64 / (64 + (π/2)·9/3) = 0.931 of the median is applied.
    expect(after.calibration.weight).toBeCloseTo(0.93, 2);
    // (and never more than the ±20 dB cap)
    expect(after.calibration.residual_db).toBeCloseTo(Math.min(20, after.calibration.median_residual_db * 0.931), 0);
    expect(['high', 'medium', 'low']).toContain(after.calibration.confidence);
    expect(after.predicted_rsrp_dbm - before.predicted_rsrp_dbm).toBeCloseTo(after.calibration.residual_db, 0);
    await db('readings').delete();
  });

  it("answers for a customer at a mast's own position, with a warning instead of a failure", async () => {
    const res = await ask(`lat=${east.lat}&lon=${east.lon}&height_m=10&antenna_id=${ids.panel}&date=2026-06-01`);
    expect(res.status).toBe(200);
    const e = res.body.items.find((i: { cell_id: string }) => i.cell_id === ids.east);
    expect(e.distance_m).toBeLessThan(2);
    expect(e.warnings.join(' ')).toMatch(/at the mast/);
  });

  it("lists only the SIM operator's cells when asked, and marks the preferred operator", async () => {
    const res = await ask(`${base()}&sim_operator=${ids.op1}&operator=${ids.op1}`);
    expect(res.status).toBe(200);
    expect(res.body.required_operator_id).toBe(ids.op1);
    expect(res.body.items.map((i: { cell_id: string }) => i.cell_id)).toEqual([ids.north]);
    expect(res.body.items[0].preferred).toBe(true);
    const plain = await ask(base());
    expect(plain.body.items.every((i: { preferred: boolean }) => !i.preferred)).toBe(true);
  });

  it('gives SINR, expected throughput and the rank score of each candidate', async () => {
    const res = await ask(base());
    for (const item of res.body.items) {
      // One cell per operator here: no co-channel neighbours, so SINR is the signal over kT₀B + 7 dB per 15 kHz (−125.2 dBm).
      expect(item.interferers).toBe(0);
      expect(item.sinr_db).toBeCloseTo(Math.min(item.predicted_rsrp_dbm + 125.215, 999), 0);
      expect(item.expected_throughput_mbps).toBeGreaterThanOrEqual(0);
      expect(item.bandwidth_mhz).toBe(10);
      expect(item.warnings.join(' ')).toMatch(/bandwidth unknown/);
    }
    expect(res.body.warnings).toEqual([]);
  });

  it('warns about a position outside every elevation grid', async () => {
    const res = await ask(`lat=-46.5&lon=-128.5&height_m=10&antenna_id=${ids.panel}&radius_m=80000&date=2026-06-01`);
    expect(res.status).toBe(200);
    expect(res.body.customer_ground_m).toBeNull();
    expect(res.body.warnings.join(' ')).toMatch(/No elevation grid covers this position/);
  });

  it.each([
    ['lat=91&lon=0', 'lat'],
    ['lat=abc&lon=0', 'lat'],
    ['lon=0', 'lat'],
    ['lat=0&lon=0&height_m=-1', 'height_m'],
    ['lat=0&lon=0&cable_m=500', 'cable_m'],
    ['lat=0&lon=0&antenna_id=x', 'antenna_id'],
    ['lat=0&lon=0&radius_m=10', 'radius_m'],
  ])('answers 400 with fields for %s', async (qs, field) => {
    const res = await ask(qs);
    expect(res.status).toBe(400);
    expect(res.body.error.fields[field]?.[0]).toEqual(expect.any(String));
  });

  it('answers 404 for an unknown antenna', async () => {
    const res = await ask(`lat=${customer.lat}&lon=${customer.lon}&antenna_id=999999`);
    expect(res.status).toBe(404);
  });
});
