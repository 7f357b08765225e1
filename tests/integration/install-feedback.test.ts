// Verified installs feed their after-install readings into the calibration of the measured cell.
import { beforeEach, describe, expect, it } from 'vitest';
import { POST as createPlan } from '../../src/pages/api/plans/index';
import { PATCH as patchPlan } from '../../src/pages/api/plans/[id]';
import { POST as addCheck } from '../../src/pages/api/plans/[id]/checks';
import { GET as shortlist } from '../../src/pages/api/shortlist/index';
import { getFreeSpacePathLossDb } from '../../src/lib/domain/link-budget';
import { call } from '../helpers/endpoint';
import { currentRowVersion, testDb, truncateAll } from '../helpers/db';
import { asSessionUser, makeUser } from '../helpers/factories';
import { insertPlanKit, plannedPlanBody } from '../helpers/plan-kit';
import type { SessionUser } from '../../src/lib/server/session-user';

let planner: SessionUser;
const ids: Record<string, string> = {};

beforeEach(async () => {
  await truncateAll();
  planner = asSessionUser(await makeUser('planner'));
  const db = testDb();
  const flat = (key: string, value: number) =>
    JSON.stringify([
      { freq_mhz: 700, [key]: value },
      { freq_mhz: 2700, [key]: value },
    ]);
  const kit = await insertPlanKit(db, {
    mast: { ground_elevation_m: 50 },
    cell: { antenna_height_m: 30 },
    antenna: { gain_table: flat('gain_dbi', 8) },
    cable: { loss_table: flat('loss_db_per_m', 0.2), connector_loss_db: 0.15, connectors: 2 },
  });
  await db('antennas').insert({ name: 'Stub', kind: 'stub', ports: 1, horizontal_beamwidth_deg: 360, gain_table: flat('gain_dbi', 2) });
  const [cust] = await db('customers')
    .insert({ name: 'Test Customer', address_label: 'Alder Farm', geom: db.raw('ST_SetSRID(ST_MakePoint(-128.52, -47.21), 4326)') })
    .returning('id');
  Object.assign(ids, { cell: kit.cellId, antenna: kit.antennaId, cable: kit.cableId, customer: String(cust.id) });
});

async function verifiedPlan(afterRsrp: number) {
  const plan = await call(createPlan, {
    user: planner,
    json: plannedPlanBody({ cellId: ids.cell, antennaId: ids.antenna, cableId: ids.cable }, ids.customer, { cable_m: 10, mount_height_m: 7 }),
  });
  const id = plan.body.id;
  const patch = async (json: object) =>
    call(patchPlan, { method: 'PATCH', user: planner, params: { id }, json: { row_version: await currentRowVersion('plans', id), ...json } });
  expect((await patch({ state: 'scheduled', scheduled_for: '2027-03-01' })).status).toBe(200);
  await call(addCheck, { user: planner, params: { id }, json: { phase: 'before', readings: [{ pci: 101, channel: 6300, rsrp_dbm: afterRsrp - 6 }] } });
  expect((await patch({ state: 'installed' })).status).toBe(200);
  const after = await call(addCheck, {
    user: planner,
    params: { id },
    json: {
      phase: 'after',
      readings: [
        { pci: 101, channel: 6300, rsrp_dbm: afterRsrp },
        { pci: 404, channel: 6300, rsrp_dbm: -120 },
      ],
    },
  });
  expect(after.status).toBe(201);
  return { id, patch };
}

const customerAt = 'lat=-47.21&lon=-128.52';

describe('install feedback', () => {
  it('adds nothing until the plan is verified, then one reading per matched PCI through the installed kit', async () => {
    const { patch } = await verifiedPlan(-80);
    expect(await testDb()('readings').count('* as n').first()).toEqual({ n: '0' });
    expect((await patch({ state: 'verified' })).status).toBe(200);
    const rows = await testDb()('readings').select('cell_id', 'pci', 'rsrp_dbm', 'antenna_gain_dbi', 'height_m', 'source');
    // PCI 404 matches no cell on channel 6300 within reach: left out.
    expect(rows).toHaveLength(1);
    expect(rows[0]).toMatchObject({ cell_id: ids.cell, pci: 101, rsrp_dbm: -80, height_m: 7, source: 'install_check' });
    // Net gain: 8 dBi − 10 m × 0.2 dB/m − 2 × 0.15 dB (connector loss, common practice)
    expect(rows[0].antenna_gain_dbi).toBeCloseTo(8 - 2 - 0.3, 6);
  });

  it('takes the readings back out when the plan steps back from verified', async () => {
    const { patch } = await verifiedPlan(-80);
    await patch({ state: 'verified' });
    await patch({ state: 'installed' });
    expect(await testDb()('readings').count('* as n').first()).toEqual({ n: '0' });
  });

  it('calibrates the shortlist at the customer from the verified reading', async () => {
    const ask = () =>
      call(shortlist, { user: planner, url: `/api/shortlist?${customerAt}&antenna_id=${ids.antenna}&cable_id=${ids.cable}&cable_m=10&height_m=7` });
    const before = (await ask()).body.items[0];
    expect(before.calibration).toBeNull();
    // A reading 10 dB above the model at the customer's own position, through the same kit.
    const { patch } = await verifiedPlan(Math.round(before.predicted_rsrp_dbm + 10));
    await patch({ state: 'verified' });
    const after = (await ask()).body.items[0];
    expect(after.calibration.readings_used).toBe(1);
    // One reading moves the prediction by w = 64 / (64 + (π/2)·64) = 0.389 of its residual (shrinkage rule).
    expect(after.calibration.weight).toBeCloseTo(0.39, 2);
    expect(after.predicted_rsrp_dbm - before.predicted_rsrp_dbm).toBeCloseTo(
      0.389 * (Math.round(before.predicted_rsrp_dbm + 10) - before.predicted_rsrp_dbm),
      0,
    );
    expect(after.calibration.confidence).toBe('low');
    // sanity: the model itself is a free-space-based figure (ITU-R P.525 loss at 806 MHz over ~12 km)
    expect(before.path_loss_db).toBeGreaterThan(getFreeSpacePathLossDb(806, 11));
  });
});
