import { beforeEach, describe, expect, it } from 'vitest';
import { GET as listCustomers, POST as createCustomer } from '../../src/pages/api/customers/index';
import { GET as getCustomer, PATCH as patchCustomer } from '../../src/pages/api/customers/[id]';
import { GET as getHistory } from '../../src/pages/api/customers/[id]/history';
import { POST as createPlan } from '../../src/pages/api/plans/index';
import { PATCH as patchPlan } from '../../src/pages/api/plans/[id]';
import { call } from '../helpers/endpoint';
import { testDb, truncateAll } from '../helpers/db';
import { asSessionUser, makeUser } from '../helpers/factories';
import type { SessionUser } from '../../src/lib/server/session-user';

const ALDER = {
  name: 'Hester Quillan',
  phone: '+00 1632 960 481',
  email: 'Hester@example.test',
  address_label: 'Alder Farm, Crake Lane, Kelvarrow',
  postcode: 'kv3 2pl',
  lat: -47.21,
  lon: -128.52,
};

async function seedOperatorAndAntenna() {
  const [op] = await testDb()('operators').insert({ name: 'Test Mobile', mcc: '001', mnc: '01', colour: '#336699' }).returning('id');
  const [ant] = await testDb()('antennas')
    .insert({ name: 'Router stub', kind: 'stub', ports: 2, horizontal_beamwidth_deg: 360, gain_table: JSON.stringify([{ freq_mhz: 800, gain_dbi: 2 }]) })
    .returning('id');
  return { operatorId: String(op.id), antennaId: String(ant.id) };
}

describe('customers API', () => {
  let planner: SessionUser;
  beforeEach(async () => {
    await truncateAll();
    planner = asSessionUser(await makeUser('planner'));
  });

  it('answers 401 when signed out', async () => {
    expect((await call(listCustomers)).status).toBe(401);
    expect((await call(createCustomer, { json: ALDER })).status).toBe(401);
    expect((await call(getCustomer, { params: { id: '1' } })).status).toBe(401);
  });

  it.each(['reviewer', 'contributor'] as const)('keeps customer records from a %s (403)', async (role) => {
    const user = asSessionUser(await makeUser(role));
    const made = await call(createCustomer, { user: planner, json: ALDER });
    for (const res of [
      await call(listCustomers, { user }),
      await call(getCustomer, { user, params: { id: made.body.id } }),
      await call(getHistory, { user, params: { id: made.body.id } }),
      await call(createCustomer, { user, json: ALDER }),
    ]) {
      expect(res.status).toBe(403);
      expect(res.body.error.code).toBe('FORBIDDEN');
    }
  });

  it('lets a surveyor read but not write', async () => {
    const surveyor = asSessionUser(await makeUser('surveyor'));
    const made = await call(createCustomer, { user: planner, json: ALDER });
    expect((await call(listCustomers, { user: surveyor })).status).toBe(200);
    expect((await call(getCustomer, { user: surveyor, params: { id: made.body.id } })).status).toBe(200);
    expect((await call(createCustomer, { user: surveyor, json: ALDER })).status).toBe(403);
    const patch = await call(patchCustomer, { method: 'PATCH', user: surveyor, params: { id: made.body.id }, json: { notes: 'x' } });
    expect(patch.status).toBe(403);
  });

  it('creates a customer, normalising contact details, audited', async () => {
    const { operatorId, antennaId } = await seedOperatorAndAntenna();
    const res = await call(createCustomer, {
      user: planner,
      json: { ...ALDER, current_operator_id: operatorId, current_antenna_id: Number(antennaId), notes: ' ' },
    });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({
      name: 'Hester Quillan',
      email: 'hester@example.test',
      postcode: 'KV3 2PL',
      lat: -47.21,
      lon: -128.52,
      current_operator_id: operatorId,
      current_operator_name: 'Test Mobile',
      current_antenna_id: antennaId,
      current_antenna_name: 'Router stub',
      notes: null,
      plan_count: 0,
      latest_plan_state: null,
      row_version: 1,
    });
    const audit = await testDb()('audit_log').where({ entity: 'customer', entity_id: res.body.id }).first();
    expect(audit).toMatchObject({ action: 'create', user_id: planner.id });
  });

  it('rejects bad input with 400 and a fields map', async () => {
    const res = await call(createCustomer, {
      user: planner,
      json: { name: '', phone: 'call me', email: 'nope', address_label: '', lat: 91, lon: 'west', current_operator_id: 'abc' },
    });
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields).sort()).toEqual(['address_label', 'current_operator_id', 'email', 'lat', 'lon', 'name', 'phone']);
    const unknownRef = await call(createCustomer, { user: planner, json: { ...ALDER, current_antenna_id: '999' } });
    expect(unknownRef.status).toBe(400);
    expect(unknownRef.body.error.fields).toEqual({ current_antenna_id: ['No such antenna in the catalogue'] });
    expect(await testDb()('customers').count('* as n').first()).toEqual({ n: '0' });
  });

  it('searches by name, address, postcode, e-mail or phone digits, and sorts', async () => {
    await call(createCustomer, { user: planner, json: ALDER });
    await call(createCustomer, {
      user: planner,
      json: { ...ALDER, name: 'Ansel Brack', email: null, phone: '00 1632 960 999', address_label: 'Low Mill, Quarren Lane', postcode: 'QD2 7XB' },
    });
    await call(createCustomer, {
      user: planner,
      json: { ...ALDER, name: 'Zora Penhallow', email: 'zora@example.test', phone: null, address_label: '4 Harbour Row', postcode: null },
    });
    const q = async (query: string) => (await call(listCustomers, { user: planner, url: `/api/customers?${query}` })).body;
    expect((await q('q=quarren')).items.map((c: { name: string }) => c.name)).toEqual(['Ansel Brack']);
    expect((await q('q=kv3')).total).toBe(1);
    expect((await q('q=zora@')).total).toBe(1);
    expect((await q('q=960999')).items[0].name).toBe('Ansel Brack');
    expect((await q('q=1632 960')).total).toBe(2);
    expect((await q('sort=name')).items.map((c: { name: string }) => c.name)).toEqual(['Ansel Brack', 'Hester Quillan', 'Zora Penhallow']);
    expect((await q('sort=name&dir=desc&limit=1')).items.map((c: { name: string }) => c.name)).toEqual(['Zora Penhallow']);
    expect((await q('sort=name&limit=1')).total).toBe(3);
    const bad = await call(listCustomers, { user: planner, url: '/api/customers?sort=shoe&dir=up&limit=x' });
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.error.fields).sort()).toEqual(['dir', 'limit', 'sort']);
  });

  it('sorts by plan state in workflow order, customers without plans last', async () => {
    const a = await call(createCustomer, { user: planner, json: { ...ALDER, name: 'A' } });
    await call(createCustomer, { user: planner, json: { ...ALDER, name: 'B' } });
    await call(createPlan, { user: planner, json: { customer_id: a.body.id } });
    const list = await call(listCustomers, { user: planner, url: '/api/customers?sort=state' });
    expect(list.body.items.map((c: { name: string; latest_plan_state: string | null }) => [c.name, c.latest_plan_state])).toEqual([
      ['A', 'enquiry'],
      ['B', null],
    ]);
  });

  it('updates a customer with optimistic concurrency, audited with before and after', async () => {
    const made = await call(createCustomer, { user: planner, json: ALDER });
    const id = made.body.id;
    const ok = await call(patchCustomer, { method: 'PATCH', user: planner, params: { id }, json: { phone: '', lat: -47.22, lon: -128.53, row_version: 1 } });
    expect(ok.status).toBe(200);
    expect(ok.body).toMatchObject({ phone: null, lat: -47.22, lon: -128.53, row_version: 2 });
    const stale = await call(patchCustomer, { method: 'PATCH', user: planner, params: { id }, json: { notes: 'gate code 1234', row_version: 1 } });
    expect(stale.status).toBe(409);
    expect(stale.body.error.message).toMatch(/Someone else changed this customer/);
    const half = await call(patchCustomer, { method: 'PATCH', user: planner, params: { id }, json: { lat: 1, row_version: 2 } });
    expect(half.status).toBe(400);
    expect(half.body.error.fields.lon).toEqual(['Give latitude and longitude together']);
    const nothing = await call(patchCustomer, { method: 'PATCH', user: planner, params: { id }, json: { row_version: 2 } });
    expect(nothing.status).toBe(400);
    const audit = await testDb()('audit_log').where({ entity: 'customer', entity_id: id, action: 'update' }).first();
    expect(audit.before).toMatchObject({ phone: '+00 1632 960 481', lat: -47.21 });
    expect(audit.after).toMatchObject({ phone: null, lat: -47.22 });
  });

  it('answers 404 for an unknown customer and 400 for a malformed id', async () => {
    expect((await call(getCustomer, { user: planner, params: { id: '999999' } })).status).toBe(404);
    expect((await call(patchCustomer, { method: 'PATCH', user: planner, params: { id: '999999' }, json: { notes: 'x', row_version: 1 } })).status).toBe(404);
    expect((await call(getHistory, { user: planner, params: { id: '999999' } })).status).toBe(404);
    expect((await call(getCustomer, { user: planner, params: { id: 'x1' } })).status).toBe(400);
  });

  it('keeps a history of the customer and their plans, newest first, with changed fields', async () => {
    const made = await call(createCustomer, { user: planner, json: ALDER });
    const id = made.body.id;
    await call(patchCustomer, { method: 'PATCH', user: planner, params: { id }, json: { notes: 'Dog on site', row_version: 1 } });
    const plan = await call(createPlan, { user: planner, json: { customer_id: id, notes: 'Wants a quote' } });
    await call(patchPlan, { method: 'PATCH', user: planner, params: { id: plan.body.id }, json: { notes: 'Quote sent', row_version: 1 } });
    // Another customer's changes stay out.
    await call(createCustomer, { user: planner, json: { ...ALDER, name: 'Someone else' } });
    const res = await call(getHistory, { user: planner, params: { id } });
    expect(res.status).toBe(200);
    expect(res.body.items.map((e: { entity: string; action: string }) => `${e.entity}:${e.action}`)).toEqual([
      'plan:update',
      'plan:create',
      'customer:update',
      'customer:create',
    ]);
    expect(res.body.items[0]).toMatchObject({ user_name: planner.name, changes: [{ field: 'notes', before: 'Wants a quote', after: 'Quote sent' }] });
    expect(res.body.items[2].changes).toEqual([{ field: 'notes', before: null, after: 'Dog on site' }]);
    expect(res.body.items[3].details).toMatchObject({ name: 'Hester Quillan' });
  });
});
