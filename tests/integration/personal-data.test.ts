// Customers' personal data reaches only the roles that may see customers, and can be erased on
// the customer's request while the non-personal history stays.
import { beforeEach, describe, expect, it } from 'vitest';
import { GET as getMast } from '../../src/pages/api/masts/[id]';
import { GET as getCustomer, PATCH as patchCustomer } from '../../src/pages/api/customers/[id]';
import { GET as getHistory } from '../../src/pages/api/customers/[id]/history';
import { POST as eraseCustomer } from '../../src/pages/api/customers/[id]/erasure';
import { createOperator } from '../../src/lib/server/repos/operators';
import { createMast } from '../../src/lib/server/repos/masts';
import { createCell } from '../../src/lib/server/repos/cells';
import { createCustomer } from '../../src/lib/server/repos/customers';
import { syncInstallReadings } from '../../src/lib/server/repos/install-feedback';
import { CellInputSchema, MastInputSchema } from '../../src/lib/schemas/masts';
import { CustomerInputSchema } from '../../src/lib/schemas/customers';
import { ROLES } from '../../src/lib/domain/roles';
import { call } from '../helpers/endpoint';
import { testDb, truncateAll } from '../helpers/db';
import { asSessionUser, makeUser } from '../helpers/factories';
import type { SessionUser } from '../../src/lib/server/session-user';

const HOME = { lat: -47.21234, lon: -128.56789 };

async function buildFixture(planner: SessionUser) {
  const db = testDb();
  const op = (await createOperator(db, { name: 'Test Mobile A', mcc: '001', mnc: '01' }, null)).id;
  const mast = (await createMast(db, MastInputSchema.parse({ name: 'Test Hill', lat: -47.2, lon: -128.5 }), null)).id;
  // 3GPP TS 36.101 Table 5.7.3-1: EARFCN 6300 is band 20.
  const cell = (await createCell(db, mast, CellInputSchema.parse({ operator_id: op, tech: 'lte', channel: 6300, pci: 101 }), null)).id;
  const customer = await createCustomer(
    db,
    CustomerInputSchema.parse({
      name: 'Hester Quillan',
      phone: '+00 1632 960 481',
      email: 'hester@example.test',
      address_label: 'Alder Farm, Crake Lane',
      postcode: 'KV3 2PL',
      notes: 'Dog at the gate',
      ...HOME,
    }),
    planner.id,
  );
  const [plan] = await db('plans')
    .insert({
      customer_id: customer.id,
      cell_id: cell,
      state: 'verified',
      notes: 'Hester wants it on the barn',
      figures: JSON.stringify({ cell_id: cell, pci: 101, predicted_rsrp_dbm: -92.5, distance_m: 1800.2, bearing_true_deg: 100.5, customer_position: HOME }),
    })
    .returning('id');
  const [check] = await db('install_checks')
    .insert({ plan_id: plan.id, phase: 'after', taken_at: new Date('2026-01-05T10:00:00Z'), notes: 'Hester made tea' })
    .returning('id');
  await db('install_check_readings').insert({ check_id: check.id, pci: 101, channel: 6300, rsrp_dbm: -85 });
  const point = (lat: number, lon: number) => db.raw('ST_SetSRID(ST_MakePoint(?, ?), 4326)', [lon, lat]);
  // One survey reading in the lane, one fed back from the install check (at the home).
  await db('readings').insert([
    {
      taken_at: new Date('2026-01-01T10:00:00Z'),
      geom: point(-47.205, -128.52),
      tech: 'lte',
      channel: 6300,
      pci: 101,
      rsrp_dbm: -100,
      cell_id: cell,
      source: 'survey',
    },
    {
      taken_at: new Date('2026-01-05T10:00:00Z'),
      geom: point(HOME.lat, HOME.lon),
      tech: 'lte',
      channel: 6300,
      pci: 101,
      rsrp_dbm: -85,
      cell_id: cell,
      source: 'install_check',
      install_check_id: check.id,
    },
  ]);
  return { mast, cell, customer: customer.id, plan: String(plan.id), check: String(check.id) };
}

let planner: SessionUser;
let f: Awaited<ReturnType<typeof buildFixture>>;
beforeEach(async () => {
  await truncateAll();
  planner = asSessionUser(await makeUser('planner'));
  f = await buildFixture(planner);
});

describe('install-check positions on the mast panel', () => {
  it.each(ROLES)('shows readings taken at a home only to roles that see customers (%s)', async (role) => {
    const user = asSessionUser(await makeUser(role));
    const res = await call(getMast, { user, params: { id: f.mast } });
    expect(res.status).toBe(200);
    const sources = res.body.recent_readings.map((r: { source: string }) => r.source).sort();
    const seesCustomers = ['admin', 'planner', 'surveyor'].includes(role);
    expect(sources).toEqual(seesCustomers ? ['install_check', 'survey'] : ['survey']);
    if (!seesCustomers) expect(JSON.stringify(res.body)).not.toContain(String(HOME.lat));
  });
});

describe('erasing a customer on request', () => {
  it('answers 401 signed out and 403 to roles that do not write plans, changing nothing', async () => {
    expect((await call(eraseCustomer, { method: 'POST', params: { id: f.customer } })).status).toBe(401);
    for (const role of ['surveyor', 'reviewer', 'contributor'] as const) {
      const res = await call(eraseCustomer, { method: 'POST', user: asSessionUser(await makeUser(role)), params: { id: f.customer } });
      expect(res.status).toBe(403);
      expect(res.body.error.code).toBe('FORBIDDEN');
    }
    expect((await testDb()('customers').where({ id: f.customer }).first()).name).toBe('Hester Quillan');
  });

  it('answers 404 for an unknown customer and 400 for a bad id', async () => {
    expect((await call(eraseCustomer, { method: 'POST', user: planner, params: { id: '424242' } })).status).toBe(404);
    expect((await call(eraseCustomer, { method: 'POST', user: planner, params: { id: 'abc' } })).status).toBe(400);
  });

  it('removes the personal data everywhere and keeps the non-personal history', async () => {
    const res = await call(eraseCustomer, { method: 'POST', user: planner, params: { id: f.customer } });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ plans_anonymised: 1, install_checks_cleared: 1, install_readings_removed: 1 });
    expect(res.body.audit_entries_scrubbed).toBeGreaterThanOrEqual(1);
    expect(res.body.customer).toMatchObject({
      name: `Erased customer ${f.customer}`,
      phone: null,
      email: null,
      postcode: null,
      notes: null,
      lat: -47.2,
      lon: -128.6,
    });
    expect(res.body.customer.erased_at).toEqual(expect.any(String));

    const db = testDb();
    const plan = await db('plans').where({ id: f.plan }).first();
    expect(plan.state).toBe('verified');
    expect(plan.cell_id).toBe(f.cell);
    expect(plan.notes).toBeNull();
    expect(plan.figures).toEqual({ cell_id: f.cell, pci: 101, predicted_rsrp_dbm: -92.5 });
    expect((await db('install_checks').where({ id: f.check }).first()).notes).toBeNull();
    expect(await db('readings').where({ source: 'install_check' }).first()).toBeUndefined();
    expect(await db('readings').where({ source: 'survey' }).first()).toBeDefined();

    // Nothing personal is left in the database, the audit log included.
    const audit = await db('audit_log').select('before', 'after');
    const everything = JSON.stringify([await db('customers').select('*'), await db('plans').select('*'), await db('install_checks').select('*'), audit]);
    for (const personal of ['Hester', 'Quillan', 'Alder Farm', '960 481', 'KV3', 'Dog at the gate', '47.21234', '128.56789', '1800.2']) {
      expect(everything).not.toContain(personal);
    }
    // The erasure itself is audited, without the erased values.
    const entry = await db('audit_log').where({ entity: 'customer', entity_id: f.customer, action: 'erase' }).first();
    expect(entry.user_id).toBe(planner.id);
    expect(entry.after).toMatchObject({ plans_anonymised: 1, install_readings_removed: 1 });
    const history = await call(getHistory, { user: planner, params: { id: f.customer } });
    expect(history.body.items.map((e: { action: string }) => e.action)).toContain('erase');
  });

  it('refuses a second erasure and edits that would bring personal data back (409)', async () => {
    expect((await call(eraseCustomer, { method: 'POST', user: planner, params: { id: f.customer } })).status).toBe(200);
    const again = await call(eraseCustomer, { method: 'POST', user: planner, params: { id: f.customer } });
    expect(again.status).toBe(409);
    expect(again.body.error.message).toMatch(/already erased/);
    const edit = await call(patchCustomer, { method: 'PATCH', user: planner, params: { id: f.customer }, json: { name: 'Hester Quillan', row_version: 2 } });
    expect(edit.status).toBe(409);
    expect((await call(getCustomer, { user: planner, params: { id: f.customer } })).body.name).toBe(`Erased customer ${f.customer}`);
  });

  it("feeds nothing back from the erased customer's install afterwards", async () => {
    expect(await syncInstallReadings(testDb(), f.plan)).toBe(1);
    await call(eraseCustomer, { method: 'POST', user: planner, params: { id: f.customer } });
    expect(await syncInstallReadings(testDb(), f.plan)).toBe(0);
    expect(await testDb()('readings').where({ source: 'install_check' }).first()).toBeUndefined();
    expect(await testDb()('readings').where({ source: 'install_check' }).first()).toBeUndefined();
  });
});
