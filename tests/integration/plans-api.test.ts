import { beforeEach, describe, expect, it } from 'vitest';
import { GET as listPlans, POST as createPlan } from '../../src/pages/api/plans/index';
import { GET as getPlan, PATCH as patchPlan } from '../../src/pages/api/plans/[id]';
import { GET as listChecks, POST as addCheck } from '../../src/pages/api/plans/[id]/checks';
import { call } from '../helpers/endpoint';
import { currentRowVersion, testDb, truncateAll } from '../helpers/db';
import { asSessionUser, makeUser } from '../helpers/factories';
import { KIT_CELL, insertPlanKit, type PlanKit } from '../helpers/plan-kit';
import type { SessionUser } from '../../src/lib/server/session-user';

interface Fixture extends PlanKit {
  customerId: string;
}

async function fixture(): Promise<Fixture> {
  const db = testDb();
  const planKit = await insertPlanKit(db);
  const [stub] = await db('antennas')
    .insert({ name: 'Router stub', kind: 'stub', ports: 1, horizontal_beamwidth_deg: 360, gain_table: JSON.stringify([{ freq_mhz: 800, gain_dbi: 2 }]) })
    .returning('id');
  const [cust] = await db('customers')
    .insert({
      name: 'Hester Quillan',
      address_label: 'Alder Farm',
      geom: db.raw('ST_SetSRID(ST_MakePoint(-128.52, -47.21), 4326)'),
      current_antenna_id: stub.id,
    })
    .returning('id');
  return { ...planKit, customerId: String(cust.id) };
}

describe('plans API', () => {
  let planner: SessionUser;
  let f: Fixture;
  const kit = () => ({ cell_id: f.cellId, antenna_id: f.antennaId, cable_id: f.cableId, cable_m: 12, mount_height_m: 7 });
  // Sends the plan's current row_version unless the test gives one.
  const patch = async (id: string, json: object, user = planner) =>
    call(patchPlan, { method: 'PATCH', user, params: { id }, json: { row_version: await currentRowVersion('plans', id), ...json } });

  beforeEach(async () => {
    await truncateAll();
    planner = asSessionUser(await makeUser('planner'));
    f = await fixture();
  });

  it('answers 401 when signed out', async () => {
    expect((await call(listPlans)).status).toBe(401);
    expect((await call(createPlan, { json: { customer_id: f.customerId } })).status).toBe(401);
    expect((await call(getPlan, { params: { id: '1' } })).status).toBe(401);
    expect((await call(addCheck, { params: { id: '1' }, json: {} })).status).toBe(401);
  });

  it.each(['reviewer', 'contributor'] as const)('keeps plans from a %s (403)', async (role) => {
    const user = asSessionUser(await makeUser(role));
    const plan = await call(createPlan, { user: planner, json: { customer_id: f.customerId } });
    expect((await call(listPlans, { user })).status).toBe(403);
    expect((await call(getPlan, { user, params: { id: plan.body.id } })).status).toBe(403);
    expect((await call(listChecks, { user, params: { id: plan.body.id } })).status).toBe(403);
    expect((await call(createPlan, { user, json: { customer_id: f.customerId } })).status).toBe(403);
    expect((await patch(plan.body.id, { notes: 'x' }, user)).status).toBe(403);
  });

  it('lets a surveyor read plans and record checks, but not change them', async () => {
    const surveyor = asSessionUser(await makeUser('surveyor'));
    const plan = await call(createPlan, { user: planner, json: { customer_id: f.customerId } });
    expect((await call(getPlan, { user: surveyor, params: { id: plan.body.id } })).status).toBe(200);
    expect((await call(createPlan, { user: surveyor, json: { customer_id: f.customerId } })).status).toBe(403);
    expect((await patch(plan.body.id, { notes: 'x' }, surveyor)).status).toBe(403);
    const check = await call(addCheck, { user: surveyor, params: { id: plan.body.id }, json: { phase: 'before', readings: [{ pci: 101, rsrp_dbm: -110 }] } });
    expect(check.status).toBe(201);
    expect(check.body.created_by).toBe(surveyor.id);
  });

  it('creates an enquiry, and a planned plan with the cell and kit and the figures the server predicts for them', async () => {
    const enquiry = await call(createPlan, { user: planner, json: { customer_id: Number(f.customerId), notes: 'Phoned in' } });
    expect(enquiry.status).toBe(201);
    expect(enquiry.body).toMatchObject({ state: 'enquiry', next_states: ['planned'], cell: null, figures: {}, row_version: 1, created_by_name: planner.name });
    // Figures sent by a client are not taken: the server computes them.
    const planned = await call(createPlan, {
      user: planner,
      json: { customer_id: f.customerId, ...kit(), figures: { predicted_rsrp_dbm: -40 }, state: 'planned' },
    });
    expect(planned.status).toBe(201);
    expect(planned.body).toMatchObject({
      customer_id: f.customerId,
      customer_name: 'Hester Quillan',
      state: 'planned',
      next_states: ['scheduled', 'enquiry'],
      cell_id: f.cellId,
      cell: {
        id: f.cellId,
        mast_name: 'Test Hill',
        operator_name: 'Test Mobile',
        ...KIT_CELL,
        lat: -47.1,
        lon: -128.5,
      },
      antenna_name: 'Panel',
      cable_name: 'Feeder',
      cable_m: 12,
      mount_height_m: 7,
      figures: {
        cell_id: f.cellId,
        customer_position: { lat: -47.21, lon: -128.52 },
        kit: { antenna_id: f.antennaId, cable_id: f.cableId, cable_m: 12, mount_height_m: 7 },
        // 7.5 dBi panel − 12 m × 0.12 dB/m − 2 connectors × 0.15 dB (catalogue default) − 2 dBi stub
        expected_gain_db: 3.8,
      },
      scheduled_for: null,
    });
    expect(planned.body.figures.predicted_rsrp_dbm).not.toBe(-40);
    expect(planned.body.figures.predicted_rsrp_dbm).toBeCloseTo(
      planned.body.figures.budget.reduce((s: number, t: { db: number }) => s + t.db, 0),
      0,
    );
    expect(planned.body.figures).toHaveProperty('sinr_db');
    expect(planned.body.figures).toHaveProperty('expected_throughput_mbps');
    const audit = await testDb()('audit_log').where({ entity: 'plan', entity_id: planned.body.id }).first();
    expect(audit).toMatchObject({ action: 'create', user_id: planner.id });
  });

  it('refuses a planned plan without its cell and kit (422 with fields)', async () => {
    const res = await call(createPlan, { user: planner, json: { customer_id: f.customerId, state: 'planned', cell_id: f.cellId } });
    expect(res.status).toBe(422);
    expect(Object.keys(res.body.error.fields).sort()).toEqual(['antenna_id', 'cable_id', 'cable_m', 'mount_height_m']);
  });

  it('rejects bad input with 400 and fields, including unknown references', async () => {
    const res = await call(createPlan, {
      user: planner,
      json: { customer_id: 'x', cable_m: -1, mount_height_m: 500, scheduled_for: '2027-02-30', state: 'verified' },
    });
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields).sort()).toEqual(['cable_m', 'customer_id', 'mount_height_m', 'scheduled_for', 'state']);
    const refs = await call(createPlan, { user: planner, json: { customer_id: '9999', cell_id: '9999', antenna_id: '9999', cable_id: '9999' } });
    expect(refs.status).toBe(400);
    expect(Object.keys(refs.body.error.fields).sort()).toEqual(['antenna_id', 'cable_id', 'cell_id', 'customer_id']);
    const nobody = await call(createPlan, { user: planner, json: { state: 'enquiry' } });
    expect(nobody.body.error.fields.customer_id).toEqual(['Choose a customer or enter a new one']);
    expect(await testDb()('plans').count('* as n').first()).toEqual({ n: '0' });
  });

  it('saves a new customer with the plan in one transaction: a failed save leaves no customer behind', async () => {
    const newCustomer = { name: 'Orla Fenwick', address_label: 'Fen End', lat: -47.25, lon: -128.55 };
    const count = async () => Number((await testDb()('customers').count('* as n').first())!.n);
    const before = await count();
    for (let attempt = 0; attempt < 2; attempt++) {
      // Planned without a mount height: refused (422) after the customer row would have been written.
      const failed = await call(createPlan, { user: planner, json: { customer: newCustomer, ...kit(), mount_height_m: null, state: 'planned' } });
      expect(failed.status).toBe(422);
      expect(failed.body.error.fields.mount_height_m).toEqual(['Enter the mount height']);
    }
    expect(await count()).toBe(before);
    const saved = await call(createPlan, { user: planner, json: { customer: newCustomer, ...kit(), state: 'planned' } });
    expect(saved.status).toBe(201);
    expect(saved.body.customer_name).toBe('Orla Fenwick');
    expect(saved.body.figures.customer_position).toEqual({ lat: -47.25, lon: -128.55 });
    expect(await count()).toBe(before + 1);
    const both = await call(createPlan, { user: planner, json: { customer: newCustomer, customer_id: f.customerId } });
    expect(both.status).toBe(400);
    expect(both.body.error.fields.customer).toBeDefined();
    const bad = await call(createPlan, { user: planner, json: { customer: { ...newCustomer, name: '' } } });
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.error.fields)).toEqual(['customer.name']);
  });

  it('recomputes the figures when the kit changes', async () => {
    const made = await call(createPlan, { user: planner, json: { customer_id: f.customerId, ...kit(), state: 'planned' } });
    const higher = await patch(made.body.id, { mount_height_m: 9, cable_m: 20 });
    expect(higher.status).toBe(200);
    expect(higher.body.figures.kit).toEqual({ antenna_id: f.antennaId, cable_id: f.cableId, cable_m: 20, mount_height_m: 9 });
    // 8 m more cable at 0.12 dB/m
    expect(higher.body.figures.expected_gain_db).toBeCloseTo(made.body.figures.expected_gain_db - 0.96, 1);
    const notes = await patch(made.body.id, { notes: 'Gate code 1234' });
    expect(notes.body.figures).toEqual(higher.body.figures);
  });

  it('lists plans by customer and state', async () => {
    await call(createPlan, { user: planner, json: { customer_id: f.customerId } });
    await call(createPlan, { user: planner, json: { customer_id: f.customerId, ...kit(), state: 'planned' } });
    const [other] = await testDb()('customers')
      .insert({ name: 'Other', address_label: 'Elsewhere', geom: testDb().raw('ST_SetSRID(ST_MakePoint(-128.6, -47.3), 4326)') })
      .returning('id');
    await call(createPlan, { user: planner, json: { customer_id: other.id } });
    const mine = await call(listPlans, { user: planner, url: `/api/plans?customer_id=${f.customerId}` });
    expect(mine.body.total).toBe(2);
    const planned = await call(listPlans, { user: planner, url: '/api/plans?state=planned' });
    expect(planned.body.items.map((p: { state: string }) => p.state)).toEqual(['planned']);
    const bad = await call(listPlans, { user: planner, url: '/api/plans?state=done&customer_id=me' });
    expect(Object.keys(bad.body.error.fields).sort()).toEqual(['customer_id', 'state']);
  });

  it('walks a plan from enquiry to verified, refusing skipped steps (409) and unready ones (422)', async () => {
    const made = await call(createPlan, { user: planner, json: { customer_id: f.customerId } });
    const id = made.body.id;

    const skip = await patch(id, { state: 'installed' });
    expect(skip.status).toBe(409);
    expect(skip.body.error).toEqual({ code: 'CONFLICT', message: 'A plan cannot go from enquiry to installed; from enquiry it can go to planned' });

    const unready = await patch(id, { state: 'planned' });
    expect(unready.status).toBe(422);
    expect(unready.body.error.code).toBe('UNPROCESSABLE_CONTENT');
    expect(unready.body.error.fields.cell_id).toEqual(['Choose the cell to aim at']);

    const planned = await patch(id, { ...kit(), state: 'planned' });
    expect(planned.status).toBe(200);
    expect(planned.body).toMatchObject({ state: 'planned', row_version: 2 });

    expect((await patch(id, { state: 'scheduled' })).body.error.fields).toEqual({ scheduled_for: ['Set the install date'] });
    const scheduled = await patch(id, { state: 'scheduled', scheduled_for: '2027-03-04' });
    expect(scheduled.body).toMatchObject({ state: 'scheduled', scheduled_for: '2027-03-04' });

    expect((await patch(id, { state: 'installed' })).body.state).toBe('installed');
    const early = await patch(id, { state: 'verified' });
    expect(early.status).toBe(422);
    expect(early.body.error.fields.checks).toEqual(['Record an after-install check first']);

    await call(addCheck, { user: planner, params: { id }, json: { phase: 'after', readings: [{ pci: 101, channel: 6300, rsrp_dbm: -98 }] } });
    const verified = await patch(id, { state: 'verified' });
    expect(verified.status).toBe(200);
    expect(verified.body).toMatchObject({ state: 'verified', next_states: ['installed'] });

    const trail = await testDb()('audit_log').where({ entity: 'plan', entity_id: id }).orderBy('id').pluck('action');
    expect(trail).toEqual(['create', 'state', 'state', 'state', 'check', 'state']);
  });

  it('steps back, and keeps the kit fixed once installed', async () => {
    const made = await call(createPlan, { user: planner, json: { customer_id: f.customerId, ...kit(), state: 'planned', scheduled_for: '2027-03-04' } });
    const id = made.body.id;
    await patch(id, { state: 'scheduled' });
    await patch(id, { state: 'installed' });
    const locked = await patch(id, { cable_m: 15 });
    expect(locked.status).toBe(422);
    expect(locked.body.error.fields).toEqual({ cable_m: ['Fixed once installed; move the plan back to scheduled to change it'] });
    expect((await patch(id, { notes: 'Cable run through the barn' })).status).toBe(200);
    const back = await patch(id, { state: 'scheduled', cable_m: 15 });
    expect(back.status).toBe(200);
    expect(back.body).toMatchObject({ state: 'scheduled', cable_m: 15 });
    const cleared = await patch(id, { cell_id: null });
    expect(cleared.status).toBe(422);
    expect(cleared.body.error.fields.cell_id).toBeDefined();
    expect((await patch(id, { state: 'planned', scheduled_for: null })).body).toMatchObject({ state: 'planned', scheduled_for: null });
    expect((await patch(id, { state: 'enquiry' })).body.state).toBe('enquiry');
  });

  it('refuses a stale edit (409) and answers 404 / 400 for bad ids', async () => {
    const made = await call(createPlan, { user: planner, json: { customer_id: f.customerId } });
    await patch(made.body.id, { notes: 'first', row_version: 1 });
    const stale = await patch(made.body.id, { notes: 'second', row_version: 1 });
    expect(stale.status).toBe(409);
    expect((await call(getPlan, { user: planner, params: { id: '9999' } })).status).toBe(404);
    expect((await patch('9999', { notes: 'x' })).status).toBe(404);
    expect((await call(addCheck, { user: planner, params: { id: '9999' }, json: { phase: 'before', readings: [{ pci: 1, rsrp_dbm: -100 }] } })).status).toBe(
      404,
    );
    expect((await call(listChecks, { user: planner, params: { id: '9999' } })).status).toBe(404);
    expect((await call(getPlan, { user: planner, params: { id: 'abc' } })).status).toBe(400);
    expect((await patch(made.body.id, {})).status).toBe(400);
  });

  it('records before and after checks and reports measured gain per PCI against the prediction', async () => {
    const made = await call(createPlan, { user: planner, json: { customer_id: f.customerId, ...kit(), state: 'planned', scheduled_for: '2027-03-04' } });
    const id = made.body.id;
    const predicted = made.body.figures;
    const before = await call(addCheck, {
      user: planner,
      params: { id },
      json: {
        phase: 'before',
        taken_at: '2027-03-04T09:10:00Z',
        readings: [
          { pci: 101, channel: 6300, rsrp_dbm: -111, rsrq_db: -14, sinr_db: 1 },
          { pci: 101, channel: 6300, rsrp_dbm: -109, sinr_db: 3 },
          { pci: 240, channel: 1300, rsrp_dbm: -118 },
        ],
        speed_tests: [{ down_mbps: 3.2, up_mbps: 0.4, latency_ms: 80 }],
      },
    });
    expect(before.status).toBe(201);
    expect(before.body).toMatchObject({
      phase: 'before',
      taken_at: '2027-03-04T09:10:00.000Z',
      readings: [{ pci: 101, channel: 6300, rsrp_dbm: -111, rsrq_db: -14, sinr_db: 1 }, {}, {}],
    });

    const tooEarly = await call(addCheck, { user: planner, params: { id }, json: { phase: 'after', readings: [{ pci: 101, rsrp_dbm: -99 }] } });
    expect(tooEarly.status).toBe(422);
    expect(tooEarly.body.error.fields.phase).toBeDefined();

    await patch(id, { state: 'scheduled' });
    await patch(id, { state: 'installed' });
    await call(addCheck, {
      user: planner,
      params: { id },
      json: {
        phase: 'after',
        taken_at: '2027-03-04T11:40:00Z',
        readings: [
          { pci: 101, channel: 6300, rsrp_dbm: -99, sinr_db: 12 },
          { pci: 240, channel: 1300, rsrp_dbm: -112 },
        ],
        speed_tests: [
          { down_mbps: 38, up_mbps: 9, latency_ms: 35 },
          { down_mbps: 42, up_mbps: 11, latency_ms: 31 },
        ],
      },
    });
    const detail = await call(getPlan, { user: planner, params: { id } });
    expect(detail.body.checks.map((c: { phase: string }) => c.phase)).toEqual(['before', 'after']);
    expect(detail.body.result).toEqual({
      before_check_id: before.body.id,
      after_check_id: expect.any(String),
      predicted_rsrp_dbm: predicted.predicted_rsrp_dbm,
      expected_throughput_mbps: predicted.expected_throughput_mbps,
      gains: [
        {
          pci: 101,
          channel: 6300,
          samples_before: 2,
          samples_after: 1,
          before_rsrp_dbm: -110,
          after_rsrp_dbm: -99,
          measured_gain_db: 11,
          predicted_gain_db: predicted.expected_gain_db,
          difference_db: expect.closeTo(11 - predicted.expected_gain_db, 1),
          before_sinr_db: 2,
          after_sinr_db: 12,
          sinr_change_db: 10,
        },
        expect.objectContaining({ pci: 240, measured_gain_db: 6, predicted_gain_db: null }),
      ],
      speed_before: { tests: 1, down_mbps: 3.2, up_mbps: 0.4, latency_ms: 80 },
      speed_after: { tests: 2, down_mbps: 40, up_mbps: 10, latency_ms: 33 },
    });
    const list = await call(listChecks, { user: planner, params: { id } });
    expect(list.body.total).toBe(2);
  });

  it('refuses an LTE PCI above 503 on an LTE plan (3GPP TS 36.211 §6.11), naming the reading', async () => {
    const made = await call(createPlan, { user: planner, json: { customer_id: f.customerId, ...kit(), state: 'planned' } });
    const res = await call(addCheck, {
      user: planner,
      params: { id: made.body.id },
      json: {
        phase: 'before',
        readings: [
          { pci: 101, rsrp_dbm: -100 },
          { pci: 999, rsrp_dbm: -100 },
        ],
      },
    });
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toEqual({ 'readings.1.pci': ['LTE PCI must be 0–503'] });
    expect(await testDb()('install_checks').count('* as n').first()).toEqual({ n: '0' });
    const ok = await call(addCheck, { user: planner, params: { id: made.body.id }, json: { phase: 'before', readings: [{ pci: 503, rsrp_dbm: -100 }] } });
    expect(ok.status).toBe(201);
  });

  it('rejects bad check input with 400 and fields', async () => {
    const made = await call(createPlan, { user: planner, json: { customer_id: f.customerId } });
    const res = await call(addCheck, {
      user: planner,
      params: { id: made.body.id },
      json: { phase: 'during', taken_at: 'yesterday', readings: [{ pci: 2000, rsrp_dbm: -20, sinr_db: 99 }], speed_tests: [{ down_mbps: -1 }] },
    });
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields).sort()).toEqual([
      'phase',
      'readings.0.pci',
      'readings.0.rsrp_dbm',
      'readings.0.sinr_db',
      'speed_tests.0.down_mbps',
      'speed_tests.0.up_mbps',
      'taken_at',
    ]);
    const empty = await call(addCheck, { user: planner, params: { id: made.body.id }, json: { phase: 'before' } });
    expect(empty.body.error.fields.readings).toEqual(['Add at least one reading or speed test']);
  });
});
