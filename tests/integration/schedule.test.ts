import { beforeEach, describe, expect, it } from 'vitest';
import { POST as createPlan } from '../../src/pages/api/plans/index';
import { GET as getPlan, PATCH as patchPlan } from '../../src/pages/api/plans/[id]';
import { POST as markInstalled } from '../../src/pages/api/plans/[id]/installed';
import { GET as listCustomers } from '../../src/pages/api/customers/index';
import { listScheduledVisits } from '../../src/lib/server/repos/schedule';
import { groupVisits } from '../../src/lib/domain/schedule';
import { call } from '../helpers/endpoint';
import { currentRowVersion, testDb, truncateAll } from '../helpers/db';
import { asSessionUser, makeUser } from '../helpers/factories';
import { insertPlanKit, plannedPlanBody, type PlanKit } from '../helpers/plan-kit';
import type { SessionUser } from '../../src/lib/server/session-user';

interface Fixture extends PlanKit {
  customer: (name: string) => Promise<string>;
}

async function fixture(): Promise<Fixture> {
  const db = testDb();
  const kit = await insertPlanKit(db);
  const customer = async (name: string) => {
    const [c] = await db('customers')
      .insert({ name, address_label: `${name} Farm`, phone: '+001 555 0101', geom: db.raw('ST_SetSRID(ST_MakePoint(-128.52, -47.21), 4326)') })
      .returning('id');
    return String(c.id);
  };
  return { ...kit, customer };
}

describe('installer schedule', () => {
  let planner: SessionUser;
  let surveyor: SessionUser;
  let f: Fixture;

  const plan = async (name: string) =>
    call(createPlan, { user: planner, json: plannedPlanBody(f, await f.customer(name), { cable_m: 10, mount_height_m: 6 }) });
  const book = async (name: string, scheduledFor: string) => {
    const created = await plan(name);
    expect(created.status).toBe(201);
    const id: string = created.body.id;
    const scheduled = await call(patchPlan, {
      method: 'PATCH',
      user: planner,
      params: { id },
      json: { state: 'scheduled', scheduled_for: scheduledFor, row_version: await currentRowVersion('plans', id) },
    });
    expect(scheduled.status).toBe(200);
    return id;
  };
  /** When the plan was marked installed (the clock of the test run is not the schedule's `today`). */
  const installedAt = (id: string, at: string) => testDb()('plans').where({ id }).update({ state_changed_at: at });
  const mark = (id: string, rowVersion: unknown, user: SessionUser | null = surveyor) =>
    call(markInstalled, { user, params: { id }, json: rowVersion === undefined ? {} : { row_version: rowVersion } });

  beforeEach(async () => {
    await truncateAll();
    planner = asSessionUser(await makeUser('planner'));
    surveyor = asSessionUser(await makeUser('surveyor'));
    f = await fixture();
  });

  it('lets a surveyor mark a scheduled plan installed, audited under their name', async () => {
    const id = await book('Ada Penhallow', '2026-12-02');
    const res = await mark(id, await currentRowVersion('plans', id));
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ id, state: 'installed', next_states: ['verified', 'scheduled'] });
    const audit = await testDb()('audit_log').where({ entity: 'plan', entity_id: id, action: 'state' }).orderBy('id', 'desc').first();
    expect(String(audit.user_id)).toBe(surveyor.id);
  });

  it('guards the step: 401 signed out, 403 for reviewers and contributors, 400 without a row version, 404 for no plan', async () => {
    const id = await book('Bran Tollis', '2026-12-02');
    const v = await currentRowVersion('plans', id);
    expect((await mark(id, v, null)).status).toBe(401);
    for (const role of ['reviewer', 'contributor'] as const) {
      const res = await mark(id, v, asSessionUser(await makeUser(role)));
      expect(res.status).toBe(403);
      expect(res.body.error.code).toBe('FORBIDDEN');
    }
    const bad = await mark(id, undefined);
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields.row_version).toBeDefined();
    expect((await mark(id, 'seven')).status).toBe(400);
    expect((await mark('999999999', 1)).status).toBe(404);
    expect((await call(getPlan, { user: surveyor, params: { id } })).body.state).toBe('scheduled');
  });

  it('refuses a stale row version (409) and leaves the plan scheduled', async () => {
    const id = await book('Cora Vell', '2026-12-02');
    const seen = await currentRowVersion('plans', id);
    // A planner moves the visit after the installer loaded the schedule.
    await call(patchPlan, { method: 'PATCH', user: planner, params: { id }, json: { scheduled_for: '2026-12-03', row_version: seen } });
    const res = await mark(id, seen);
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('CONFLICT');
    expect(res.body.error.message).toMatch(/reload/i);
    expect((await call(getPlan, { user: surveyor, params: { id } })).body.state).toBe('scheduled');
  });

  it('refuses to mark a plan installed that is not scheduled (409 naming where it can go)', async () => {
    const created = await plan('Dai Orme');
    const res = await mark(created.body.id, await currentRowVersion('plans', created.body.id));
    expect(res.status).toBe(409);
    expect(res.body.error.message).toMatch(/planned to installed/);
  });

  it('lists scheduled visits with customer, place, mast, cell and aim, and this week’s installs, in day order', async () => {
    const later = await book('Later Lane', '2026-12-10');
    const late = await book('Late Lodge', '2026-11-20');
    const today = await book('Today Toft', '2026-12-02');
    const doneThisWeek = await book('Done Dairy', '2026-11-30');
    const doneLastWeek = await book('Old Orchard', '2026-11-23');
    for (const id of [doneThisWeek, doneLastWeek]) expect((await mark(id, await currentRowVersion('plans', id))).status).toBe(200);
    await installedAt(doneLastWeek, '2026-11-24T10:00:00Z');

    const visits = await listScheduledVisits(testDb(), '2026-12-02');
    expect(visits.map((v) => v.planId)).toEqual([late, doneThisWeek, today, later]);
    const first = visits.find((v) => v.planId === today)!;
    expect(first).toMatchObject({
      state: 'scheduled',
      scheduledFor: '2026-12-02',
      customerName: 'Today Toft',
      addressLabel: 'Today Toft Farm',
      phone: '+001 555 0101',
      mastName: 'Test Hill',
      operatorName: 'Test Mobile',
      tech: 'lte',
      band: 'B20',
      channel: 6300,
      pci: 101,
      antennaName: 'Panel',
      mountHeightM: 6,
      afterCheckCount: 0,
    });
    // The aim comes from the figures the server saved with the kit: the mast lies north of the customer.
    expect(first.bearingTrueDeg).toBeGreaterThan(0);
    expect(Math.min(first.bearingTrueDeg!, 360 - first.bearingTrueDeg!)).toBeLessThan(30);
    expect(first.bearingMagneticDeg).not.toBe(first.bearingTrueDeg);

    const groups = groupVisits(visits, '2026-12-02');
    expect(groups.map((g) => [g.group, g.visits.map((v) => v.customerName)])).toEqual([
      ['past-due', ['Late Lodge']],
      ['this-week', ['Done Dairy', 'Today Toft']],
      ['later', ['Later Lane']],
    ]);
  });

  it('keeps a past due visit installed this week in view, as installed, with the past due visits', async () => {
    const late = await book('Late Lodge', '2026-11-20');
    const lateDone = await book('Mended Mill', '2026-11-18');
    const thisWeek = await book('Today Toft', '2026-12-02');
    expect((await mark(lateDone, await currentRowVersion('plans', lateDone))).status).toBe(200);
    await installedAt(lateDone, '2026-12-02T09:30:00Z');

    const visits = await listScheduledVisits(testDb(), '2026-12-02');
    expect(visits.map((v) => [v.planId, v.state])).toEqual([
      [lateDone, 'installed'],
      [late, 'scheduled'],
      [thisWeek, 'scheduled'],
    ]);
    const groups = groupVisits(visits, '2026-12-02');
    expect(groups.map((g) => [g.group, g.visits.map((v) => v.customerName)])).toEqual([
      ['past-due', ['Mended Mill', 'Late Lodge']],
      ['this-week', ['Today Toft']],
    ]);

    // Once its week is over, the install leaves the schedule.
    expect((await listScheduledVisits(testDb(), '2026-12-07')).map((v) => v.planId)).toEqual([late, thisWeek]);
  });

  it('filters customers by the state of their plans, and refuses an unknown state', async () => {
    await book('Scheduled Steading', '2026-12-04');
    const installed = await book('Installed Inn', '2026-12-01');
    await mark(installed, await currentRowVersion('plans', installed));
    await f.customer('No Plan Nook');

    const names = async (state?: string) => {
      const res = await call(listCustomers, { user: surveyor, url: `/api/customers${state ? `?state=${state}` : ''}` });
      expect(res.status).toBe(200);
      return res.body.items.map((c: { name: string }) => c.name).sort();
    };
    expect(await names('scheduled')).toEqual(['Scheduled Steading']);
    expect(await names('installed')).toEqual(['Installed Inn']);
    expect(await names('verified')).toEqual([]);
    expect(await names()).toEqual(['Installed Inn', 'No Plan Nook', 'Scheduled Steading']);
    const bad = await call(listCustomers, { user: surveyor, url: '/api/customers?state=done' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields.state).toBeDefined();
  });
});
