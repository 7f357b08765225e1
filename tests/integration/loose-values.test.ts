// Bad input is a clear 400/409, never a 500 or a silently different value: NUL bytes, numbers
// in other notations, impossible dates and years, int4 overflow, 3D and antimeridian regions,
// aliased ids, duplicate names, lost updates, weak passwords.
import { beforeEach, describe, expect, it } from 'vitest';
import { POST as createCustomer } from '../../src/pages/api/customers/index';
import { PATCH as patchCustomer } from '../../src/pages/api/customers/[id]';
import { POST as createPlan } from '../../src/pages/api/plans/index';
import { PATCH as patchPlan } from '../../src/pages/api/plans/[id]';
import { GET as getMast } from '../../src/pages/api/masts/[id]';
import { POST as createCell } from '../../src/pages/api/masts/[id]/cells';
import { PATCH as patchCell } from '../../src/pages/api/cells/[id]';
import { GET as search } from '../../src/pages/api/search/index';
import { GET as sample } from '../../src/pages/api/elevation/sample';
import { POST as createOperator } from '../../src/pages/api/operators/index';
import { POST as createRegion } from '../../src/pages/api/regions/index';
import { createMast } from '../../src/lib/server/repos/masts';
import { MastInputSchema } from '../../src/lib/schemas/masts';
import { dateField, dateTimeField, idParam, intParam, numberParam } from '../../src/lib/schemas/params';
import { SignupSchema } from '../../src/lib/schemas/accounts';
import { passwordProblem } from '../../src/lib/domain/password-rules';
import { appErrorFromDatabase, isDatabaseUnavailable } from '../../src/lib/server/db-errors';
import { call } from '../helpers/endpoint';
import { testDb, truncateAll } from '../helpers/db';
import { asSessionUser, makeUser } from '../helpers/factories';

describe('shared field set (schemas)', () => {
  it('reads query numbers in decimal only: blank is missing, 0x10 is not 16', () => {
    const lat = numberParam('Latitude');
    expect(lat.safeParse('').success).toBe(false);
    expect(lat.safeParse('   ').success).toBe(false);
    expect(lat.safeParse('0x10').success).toBe(false);
    expect(lat.safeParse('0b11').success).toBe(false);
    expect(lat.safeParse('Infinity').success).toBe(false);
    expect(lat.parse('-47.25')).toBe(-47.25);
    expect(lat.parse('1e2')).toBe(100);
    expect(intParam('limit', 1, 50, 10).safeParse('99999999999999999999').success).toBe(false);
  });

  it('refuses dates that do not exist and absurd years', () => {
    for (const bad of ['2025-02-30', '2025-13-01', '0000-01-01', '9999-12-31', '2025-2-3', '275760-09-13']) {
      expect(dateField.safeParse(bad).success, bad).toBe(false);
    }
    expect(dateField.parse('2028-02-29')).toBe('2028-02-29');
    expect(dateTimeField.safeParse('9999-01-01T00:00:00Z').success).toBe(false);
    expect(dateTimeField.safeParse('2027-02-30T10:00:00Z').success).toBe(false);
    expect(dateTimeField.parse('2027-03-01T10:30:00+02:00').toISOString()).toBe('2027-03-01T08:30:00.000Z');
  });

  it('does not let 01 alias 1', () => {
    expect(idParam.safeParse('01').success).toBe(false);
    expect(idParam.safeParse('0').success).toBe(false);
    expect(idParam.safeParse('1').success).toBe(true);
  });

  it('asks for 12 characters and refuses the commonest passwords (NIST SP 800-63B §5.1.1.2)', () => {
    expect(passwordProblem(' '.repeat(14))).toMatch(/12 characters/);
    expect(passwordProblem('   short    ')).toMatch(/12 characters/);
    expect(passwordProblem('aaaaaaaaaaaaaa')).toMatch(/more than one/);
    for (const common of ['Password1234', 'password2025!', 'Welcome-2025', 'qwertyuiop123', '123456789012', 'Summer2025Summer']) {
      expect(passwordProblem(common), common).toMatch(/most common/);
    }
    expect(passwordProblem('correct horse battery')).toBeNull();
    const signup = SignupSchema.safeParse({ name: 'Ana', email: 'ana@example.test', password: 'Password1234' });
    expect(signup.success).toBe(false);
  });

  it('maps database refusals to 4xx in one place', () => {
    expect(appErrorFromDatabase({ code: '23505', detail: 'Key (lower(name))=(North Mobile) already exists.' })).toMatchObject({
      code: 'CONFLICT',
      fields: { name: ['Already taken'] },
    });
    expect(appErrorFromDatabase({ code: '22021' })?.code).toBe('BAD_REQUEST');
    expect(appErrorFromDatabase({ code: '22008' })?.code).toBe('BAD_REQUEST');
    expect(appErrorFromDatabase({ code: '22003' })?.code).toBe('BAD_REQUEST');
    expect(appErrorFromDatabase({ code: 'ECONNREFUSED' })?.code).toBe('SERVICE_UNAVAILABLE');
    expect(isDatabaseUnavailable({ name: 'KnexTimeoutError', message: 'Knex: Timeout acquiring a connection.' })).toBe(true);
    expect(appErrorFromDatabase(new Error('bug'))).toBeNull();
  });
});

describe('endpoints with bad values', () => {
  let planner: ReturnType<typeof asSessionUser>;
  let admin: ReturnType<typeof asSessionUser>;
  beforeEach(async () => {
    await truncateAll();
    planner = asSessionUser(await makeUser('planner'));
    admin = asSessionUser(await makeUser('admin'));
  });

  it('answers 400 for NUL bytes in any text field or search, not 500', async () => {
    const res = await call(createCustomer, { user: planner, json: { name: 'Ana\u0000', address_label: 'Farm', lat: -47.2, lon: -128.5 } });
    expect(res.status).toBe(400);
    expect(res.body.error.fields.name).toBeDefined();
    const q = await call(search, { user: planner, url: '/api/search?q=ab%00cd' });
    expect(q.status).toBe(400);
    const nested = await call(createRegion, {
      user: admin,
      json: {
        name: 'Ok',
        geometry: {
          type: 'Polygon',
          coordinates: [
            [
              [0, 0],
              [1, 0],
              [1, 1],
              [0, 0],
            ],
          ],
          note: 'x\u0000',
        },
      },
    });
    expect(nested.status).toBe(400);
  });

  it('answers 400 for an empty or hex coordinate instead of reading 0 or 16', async () => {
    expect((await call(sample, { user: planner, url: '/api/elevation/sample?lat=&lon=10' })).status).toBe(400);
    expect((await call(sample, { user: planner, url: '/api/elevation/sample?lat=0x10&lon=10' })).status).toBe(400);
  });

  it('answers 400 for a channel beyond int4 and for an impossible install date', async () => {
    const mast = await createMast(testDb(), MastInputSchema.parse({ name: 'Test Hill', lat: -47.2, lon: -128.5 }), null);
    const op = await call(createOperator, { user: admin, json: { name: 'Test Mobile', mcc: '001', mnc: '01' } });
    const cell = await call(createCell, { user: admin, params: { id: mast.id }, json: { operator_id: op.body.id, tech: 'lte', channel: 2 ** 31 } });
    expect(cell.status).toBe(400);
    expect(cell.body.error.fields.channel).toBeDefined();
    const customer = await call(createCustomer, { user: planner, json: { name: 'Ana', address_label: 'Farm', lat: -47.2, lon: -128.5 } });
    const plan = await call(createPlan, { user: planner, json: { customer_id: customer.body.id, scheduled_for: '2025-02-30' } });
    expect(plan.status).toBe(400);
    expect(plan.body.error.fields.scheduled_for).toBeDefined();
    const far = await call(createPlan, { user: planner, json: { customer_id: customer.body.id, scheduled_for: '9999-01-01' } });
    expect(far.status).toBe(400);
  });

  it('does not alias /api/masts/01 to mast 1', async () => {
    const mast = await createMast(testDb(), MastInputSchema.parse({ name: 'Test Hill', lat: -47.2, lon: -128.5 }), null);
    expect((await call(getMast, { user: planner, params: { id: mast.id } })).status).toBe(200);
    expect((await call(getMast, { user: planner, params: { id: `0${mast.id}` } })).status).toBe(400);
  });

  it('keeps regions 2D and refuses one drawn across the antimeridian', async () => {
    const flat = await call(createRegion, {
      user: admin,
      json: {
        name: 'With heights',
        geometry: {
          type: 'Polygon',
          coordinates: [
            [
              [10, 10, 5],
              [11, 10, 5],
              [11, 11, 7],
              [10, 10, 5],
            ],
          ],
        },
      },
    });
    expect(flat.status).toBe(201);
    expect(flat.body.geometry.coordinates[0][0][0]).toEqual([10, 10]);
    const wrapped = await call(createRegion, {
      user: admin,
      json: {
        name: 'Dateline',
        geometry: {
          type: 'Polygon',
          coordinates: [
            [
              [179, 0],
              [-179, 0],
              [-179, 1],
              [179, 1],
              [179, 0],
            ],
          ],
        },
      },
    });
    expect(wrapped.status).toBe(400);
    expect(JSON.stringify(wrapped.body.error.fields)).toMatch(/antimeridian/);
  });

  it('gives one operator and one 409 when the same name is created twice at once', async () => {
    const results = await Promise.all([
      call(createOperator, { user: admin, json: { name: 'North Mobile', mcc: '001', mnc: '10' } }),
      call(createOperator, { user: admin, json: { name: 'north mobile', mcc: '001', mnc: '11' } }),
    ]);
    expect(results.map((r) => r.status).sort()).toEqual([201, 409]);
    const conflict = results.find((r) => r.status === 409)!;
    expect(conflict.body.error.code).toBe('CONFLICT');
    expect(await testDb()('operators').count('* as n').first()).toEqual({ n: '1' });
  });

  it('refuses a stale cell PATCH with 409, and PATCHes of plans and customers without row_version', async () => {
    const mast = await createMast(testDb(), MastInputSchema.parse({ name: 'Test Hill', lat: -47.2, lon: -128.5 }), null);
    const op = await call(createOperator, { user: admin, json: { name: 'Test Mobile', mcc: '001', mnc: '01' } });
    // 3GPP TS 36.101 Table 5.7.3-1: EARFCN 6300 is in B20.
    const cell = await call(createCell, { user: admin, params: { id: mast.id }, json: { operator_id: op.body.id, tech: 'lte', channel: 6300 } });
    expect(cell.body.row_version).toBe(1);
    const first = await call(patchCell, { method: 'PATCH', user: admin, params: { id: cell.body.id }, json: { pci: 101, row_version: 1 } });
    expect(first.body).toMatchObject({ pci: 101, row_version: 2 });
    const second = await call(patchCell, { method: 'PATCH', user: admin, params: { id: cell.body.id }, json: { pci: 202, row_version: 1 } });
    expect(second.status).toBe(409);
    expect((await testDb()('cells').where({ id: cell.body.id }).first('pci')).pci).toBe(101);
    const noVersion = await call(patchCell, { method: 'PATCH', user: admin, params: { id: cell.body.id }, json: { pci: 303 } });
    expect(noVersion.body.error.fields.row_version).toBeDefined();

    const customer = await call(createCustomer, { user: planner, json: { name: 'Ana', address_label: 'Farm', lat: -47.2, lon: -128.5 } });
    const c = await call(patchCustomer, { method: 'PATCH', user: planner, params: { id: customer.body.id }, json: { notes: 'x' } });
    expect(c.status).toBe(400);
    expect(c.body.error.fields.row_version).toBeDefined();
    const plan = await call(createPlan, { user: planner, json: { customer_id: customer.body.id } });
    const p = await call(patchPlan, { method: 'PATCH', user: planner, params: { id: plan.body.id }, json: { notes: 'x' } });
    expect(p.status).toBe(400);
    expect(p.body.error.fields.row_version).toBeDefined();
  });
});
