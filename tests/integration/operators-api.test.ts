import { beforeEach, describe, expect, it } from 'vitest';
import { GET as listOperators, POST as createOperator } from '../../src/pages/api/operators/index';
import { GET as getOperator, PATCH as patchOperator } from '../../src/pages/api/operators/[id]';
import { OPERATOR_PALETTE } from '../../src/lib/schemas/operators';
import { call } from '../helpers/endpoint';
import { testDb, truncateAll } from '../helpers/db';
import { asSessionUser, makeUser } from '../helpers/factories';

// MCC 001 / MNC 01… is the test network code (ITU-T E.212), as the demo uses.
const OP = { name: 'Test Mobile', mcc: '001', mnc: '01' };

describe('operators API', () => {
  beforeEach(truncateAll);

  it('answers 401 signed out', async () => {
    const res = await call(listOperators);
    expect(res.status).toBe(401);
    expect(res.body.error.code).toBe('UNAUTHORIZED');
  });

  it.each(['planner', 'surveyor', 'reviewer', 'contributor'] as const)('lets a %s read but not write (403)', async (role) => {
    const admin = asSessionUser(await makeUser('admin'));
    const user = asSessionUser(await makeUser(role));
    const made = await call(createOperator, { user: admin, json: OP });
    expect((await call(listOperators, { user })).body.total).toBe(1);
    expect((await call(getOperator, { user, params: { id: made.body.id } })).status).toBe(200);
    const create = await call(createOperator, { user, json: { ...OP, mnc: '02' } });
    expect(create.status).toBe(403);
    expect(create.body.error.code).toBe('FORBIDDEN');
    expect((await call(patchOperator, { method: 'PATCH', user, params: { id: made.body.id }, json: { colour: '#000000' } })).status).toBe(403);
  });

  it('gives new operators the colour-blind-safe palette in order, unless a colour is given', async () => {
    const admin = asSessionUser(await makeUser('admin'));
    const a = await call(createOperator, { user: admin, json: OP });
    expect(a.status).toBe(201);
    expect(a.body).toMatchObject({ name: 'Test Mobile', mcc: '001', mnc: '01', plmn: '001-01', colour: OPERATOR_PALETTE[0], cell_count: 0 });
    const b = await call(createOperator, { user: admin, json: { ...OP, name: 'Second', mnc: '02', colour: '#ABCDEF' } });
    expect(b.body.colour).toBe('#abcdef');
    const c = await call(createOperator, { user: admin, json: { ...OP, name: 'Third', mnc: '003' } });
    expect(c.body.colour).toBe(OPERATOR_PALETTE[1]);
    const list = await call(listOperators, { user: admin });
    expect(list.body.items.map((o: { name: string }) => o.name)).toEqual(['Test Mobile', 'Second', 'Third']);
  });

  it('lets an admin change the colour and name, audited', async () => {
    const admin = asSessionUser(await makeUser('admin'));
    const { id } = (await call(createOperator, { user: admin, json: OP })).body;
    const res = await call(patchOperator, { method: 'PATCH', user: admin, params: { id }, json: { colour: '#CC79A7', name: 'Renamed' } });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ colour: '#cc79a7', name: 'Renamed' });
    const audit = await testDb()('audit_log').where({ entity: 'operator', entity_id: id }).orderBy('id');
    expect(audit.map((a) => a.action)).toEqual(['create', 'update']);
    expect(audit[1].before.colour).toBe(OPERATOR_PALETTE[0]);
    expect(audit[1].after.colour).toBe('#cc79a7');
  });

  it('refuses a second operator with the same MCC and MNC (409)', async () => {
    const admin = asSessionUser(await makeUser('admin'));
    await call(createOperator, { user: admin, json: OP });
    const dup = await call(createOperator, { user: admin, json: { ...OP, name: 'Copy' } });
    expect(dup.status).toBe(409);
    expect(dup.body.error.code).toBe('CONFLICT');
    const other = (await call(createOperator, { user: admin, json: { ...OP, name: 'Other', mnc: '02' } })).body;
    const clash = await call(patchOperator, { method: 'PATCH', user: admin, params: { id: other.id }, json: { mnc: '01' } });
    expect(clash.status).toBe(409);
  });

  it.each([
    [{ ...OP, mcc: '01' }, 'mcc'],
    [{ ...OP, mnc: '1' }, 'mnc'],
    [{ ...OP, mnc: 'ab' }, 'mnc'],
    [{ ...OP, colour: 'blue' }, 'colour'],
    [{ ...OP, name: '' }, 'name'],
  ])('answers 400 with fields for bad input (%#)', async (body, field) => {
    const admin = asSessionUser(await makeUser('admin'));
    const res = await call(createOperator, { user: admin, json: body });
    expect(res.status).toBe(400);
    expect(res.body.error.fields[field]).toBeDefined();
  });

  it('answers 404 for an unknown operator', async () => {
    const admin = asSessionUser(await makeUser('admin'));
    expect((await call(getOperator, { user: admin, params: { id: '999' } })).status).toBe(404);
    expect((await call(patchOperator, { method: 'PATCH', user: admin, params: { id: '999' }, json: { name: 'x' } })).status).toBe(404);
  });
});
