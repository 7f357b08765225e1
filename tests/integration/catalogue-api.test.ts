import { beforeEach, describe, expect, it } from 'vitest';
import { GET as listAntennas, POST as createAntenna } from '../../src/pages/api/catalogue/antennas/index';
import { GET as getAntenna, PATCH as patchAntenna, DELETE as deleteAntenna } from '../../src/pages/api/catalogue/antennas/[id]';
import { GET as listCables, POST as createCable } from '../../src/pages/api/catalogue/cables/index';
import { GET as getCable, PATCH as patchCable, DELETE as deleteCable } from '../../src/pages/api/catalogue/cables/[id]';
import { ROLES } from '../../src/lib/domain/roles';
import { call } from '../helpers/endpoint';
import { testDb, truncateAll } from '../helpers/db';
import { asSessionUser, makeUser } from '../helpers/factories';
import { FEEDER_BODY, PANEL_BODY } from '../helpers/catalogue-bodies';

describe('catalogue API', () => {
  beforeEach(truncateAll);

  it('answers 401 when signed out', async () => {
    for (const route of [listAntennas, listCables]) {
      const res = await call(route);
      expect(res.status).toBe(401);
      expect(res.body.error.code).toBe('UNAUTHORIZED');
    }
  });

  it.each(ROLES.filter((r) => r !== 'admin'))('lets a %s read but not write', async (role) => {
    const admin = asSessionUser(await makeUser('admin'));
    const user = asSessionUser(await makeUser(role));
    const made = await call(createAntenna, { user: admin, json: PANEL_BODY });
    expect((await call(listAntennas, { user })).status).toBe(200);
    expect((await call(getAntenna, { user, params: { id: made.body.id } })).status).toBe(200);
    const create = await call(createAntenna, { user, json: { ...PANEL_BODY, name: 'Other' } });
    expect(create.status).toBe(403);
    expect(create.body.error.code).toBe('FORBIDDEN');
    expect((await call(patchAntenna, { method: 'PATCH', user, params: { id: made.body.id }, json: { ports: 4 } })).status).toBe(403);
    expect((await call(deleteAntenna, { method: 'DELETE', user, params: { id: made.body.id } })).status).toBe(403);
    expect((await call(createCable, { user, json: FEEDER_BODY })).status).toBe(403);
    expect(await testDb()('antennas').count('* as n').first()).toEqual({ n: '1' });
  });

  it('creates, lists, updates and deletes an antenna, each audited', async () => {
    const admin = asSessionUser(await makeUser('admin'));
    const created = await call(createAntenna, { user: admin, json: { ...PANEL_BODY, notes: '  Wall bracket included ' } });
    expect(created.status).toBe(201);
    expect(created.body).toMatchObject({ ...PANEL_BODY, notes: 'Wall bracket included' });
    const id = created.body.id;
    const list = await call(listAntennas, { user: admin });
    expect(list.body).toMatchObject({ total: 1, items: [{ id, name: 'Test panel' }] });
    const patched = await call(patchAntenna, { method: 'PATCH', user: admin, params: { id }, json: { horizontal_beamwidth_deg: 35 } });
    expect(patched.status).toBe(200);
    expect(patched.body.horizontal_beamwidth_deg).toBe(35);
    const gone = await call(deleteAntenna, { method: 'DELETE', user: admin, params: { id } });
    expect(gone.status).toBe(204);
    expect((await call(getAntenna, { user: admin, params: { id } })).status).toBe(404);
    const actions = await testDb()('audit_log').where({ entity: 'antenna', entity_id: id }).orderBy('id').pluck('action');
    expect(actions).toEqual(['create', 'update', 'delete']);
  });

  it('defaults omni and stub antennas to 360° and a single port', async () => {
    const admin = asSessionUser(await makeUser('admin'));
    const res = await call(createAntenna, { user: admin, json: { name: 'Whip', kind: 'stub', gain_table: [{ freq_mhz: 800, gain_dbi: 2 }] } });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ horizontal_beamwidth_deg: 360, ports: 1 });
    // Turning it into a directional antenna needs a beamwidth below 360°.
    const bad = await call(patchAntenna, { method: 'PATCH', user: admin, params: { id: res.body.id }, json: { kind: 'directional' } });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields.horizontal_beamwidth_deg).toBeDefined();
  });

  it('rejects bad antenna input with 400 and field messages', async () => {
    const admin = asSessionUser(await makeUser('admin'));
    const res = await call(createAntenna, {
      user: admin,
      json: {
        name: '',
        kind: 'dish',
        ports: 0,
        gain_table: [
          { freq_mhz: 1800, gain_dbi: 8 },
          { freq_mhz: 7000, gain_dbi: 'x' },
        ],
      },
    });
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toMatchObject({
      name: ['Required'],
      kind: [expect.stringContaining('directional')],
      ports: ['At least 1 port'],
      'gain_table.1.freq_mhz': ['Frequency must be at most 6000 MHz'],
      'gain_table.1.gain_dbi': ['Gain must be a number'],
    });
    const unsorted = await call(createAntenna, { user: admin, json: { ...PANEL_BODY, gain_table: [PANEL_BODY.gain_table[1], PANEL_BODY.gain_table[0]] } });
    expect(unsorted.body.error.fields).toEqual({ 'gain_table.1.freq_mhz': ['List frequencies from low to high, each once'] });
    const empty = await call(createAntenna, { user: admin, json: { ...PANEL_BODY, gain_table: [] } });
    expect(empty.body.error.fields.gain_table).toEqual(['Add at least one row']);
    const directional = await call(createAntenna, { user: admin, json: { ...PANEL_BODY, horizontal_beamwidth_deg: undefined } });
    expect(directional.body.error.fields.horizontal_beamwidth_deg).toEqual(['Required for a directional antenna']);
    const omni = await call(createAntenna, { user: admin, json: { ...PANEL_BODY, kind: 'omni' } });
    expect(omni.body.error.fields.horizontal_beamwidth_deg).toEqual(['An omni antenna covers 360°']);
  });

  it('refuses a duplicate name (any case) with 409', async () => {
    const admin = asSessionUser(await makeUser('admin'));
    await call(createAntenna, { user: admin, json: PANEL_BODY });
    const dup = await call(createAntenna, { user: admin, json: { ...PANEL_BODY, name: 'TEST PANEL' } });
    expect(dup.status).toBe(409);
    expect(dup.body.error.code).toBe('CONFLICT');
  });

  it('answers 404 for unknown ids and 400 for malformed ones', async () => {
    const admin = asSessionUser(await makeUser('admin'));
    expect((await call(getAntenna, { user: admin, params: { id: '424242' } })).status).toBe(404);
    expect((await call(patchCable, { method: 'PATCH', user: admin, params: { id: '424242' }, json: { connectors: 3 } })).status).toBe(404);
    expect((await call(deleteCable, { method: 'DELETE', user: admin, params: { id: '424242' } })).status).toBe(404);
    expect((await call(getCable, { user: admin, params: { id: 'one' } })).status).toBe(400);
  });

  it('creates a cable with common-practice connector defaults and edits it', async () => {
    const admin = asSessionUser(await makeUser('admin'));
    const created = await call(createCable, { user: admin, json: FEEDER_BODY });
    expect(created.status).toBe(201);
    // 0.1–0.2 dB per mated pair — common practice.
    expect(created.body).toMatchObject({ ...FEEDER_BODY, connector_loss_db: 0.15, connectors: 2, notes: null });
    const patched = await call(patchCable, { method: 'PATCH', user: admin, params: { id: created.body.id }, json: { connectors: 4 } });
    expect(patched.body.connectors).toBe(4);
    const nothing = await call(patchCable, { method: 'PATCH', user: admin, params: { id: created.body.id }, json: {} });
    expect(nothing.status).toBe(400);
    const list = await call(listCables, { user: admin });
    expect(list.body.total).toBe(1);
  });

  it('rejects bad cable input with 400 and field messages', async () => {
    const admin = asSessionUser(await makeUser('admin'));
    const res = await call(createCable, {
      user: admin,
      json: { name: 'Bad', loss_table: [{ freq_mhz: 300, loss_db_per_m: 0 }], connector_loss_db: -1, connectors: 2.5 },
    });
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toMatchObject({
      'loss_table.0.freq_mhz': ['Frequency must be at least 400 MHz'],
      'loss_table.0.loss_db_per_m': ['Loss must be above 0 dB/m'],
      connector_loss_db: ['Cannot be negative'],
      connectors: ['Connectors must be a whole number'],
    });
    const notJson = await call(createCable, { user: admin, body: 'name=x', headers: { 'content-type': 'text/plain' } });
    expect(notJson.status).toBe(415);
  });

  it('will not delete kit that a plan uses (409)', async () => {
    const admin = asSessionUser(await makeUser('admin'));
    const antenna = await call(createAntenna, { user: admin, json: PANEL_BODY });
    const cable = await call(createCable, { user: admin, json: FEEDER_BODY });
    const [customer] = await testDb()('customers')
      .insert({ name: 'Test customer', address_label: 'Test farm', geom: testDb().raw('ST_SetSRID(ST_MakePoint(-128.5, -47.2), 4326)') })
      .returning('id');
    await testDb()('plans').insert({ customer_id: customer.id, antenna_id: antenna.body.id, cable_id: cable.body.id });
    const a = await call(deleteAntenna, { method: 'DELETE', user: admin, params: { id: antenna.body.id } });
    expect(a.status).toBe(409);
    expect(a.body.error.message).toContain('1 plan');
    expect((await call(deleteCable, { method: 'DELETE', user: admin, params: { id: cable.body.id } })).status).toBe(409);
  });
});
