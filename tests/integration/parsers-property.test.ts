// Property-based checks of every endpoint parser (fast-check), through the real handlers against the
// test database: whatever a client sends, the answer is never a 5xx; input the zod schema rejects is
// a 4xx in the error shape {"error":{"code","message","fields"}} and leaves every table as it was.
import type { APIRoute } from 'astro';
import fc from 'fast-check';
import type { ZodTypeAny } from 'zod';
import { beforeAll, describe, expect, it } from 'vitest';
import { POST as createMast, GET as listMasts } from '../../src/pages/api/masts/index';
import { GET as getMast, PATCH as patchMast, DELETE as deleteMast } from '../../src/pages/api/masts/[id]';
import { POST as createCell } from '../../src/pages/api/masts/[id]/cells';
import { PATCH as patchCell } from '../../src/pages/api/cells/[id]';
import { POST as createOperator } from '../../src/pages/api/operators/index';
import { PATCH as patchOperator } from '../../src/pages/api/operators/[id]';
import { POST as createCustomer, GET as listCustomers } from '../../src/pages/api/customers/index';
import { GET as getCustomer, PATCH as patchCustomer } from '../../src/pages/api/customers/[id]';
import { POST as createPlan, GET as listPlans } from '../../src/pages/api/plans/index';
import { GET as getPlan, PATCH as patchPlan } from '../../src/pages/api/plans/[id]';
import { POST as addCheck } from '../../src/pages/api/plans/[id]/checks';
import { POST as createRegion } from '../../src/pages/api/regions/index';
import { PATCH as patchRegion } from '../../src/pages/api/regions/[id]';
import { POST as createAntenna } from '../../src/pages/api/catalogue/antennas/index';
import { PATCH as patchAntenna } from '../../src/pages/api/catalogue/antennas/[id]';
import { POST as createCable } from '../../src/pages/api/catalogue/cables/index';
import { PATCH as patchCable } from '../../src/pages/api/catalogue/cables/[id]';
import { POST as inviteUser } from '../../src/pages/api/users/index';
import { PATCH as patchUser } from '../../src/pages/api/users/[id]';
import { POST as login } from '../../src/pages/api/auth/login';
import { POST as signup } from '../../src/pages/api/auth/signup';
import { POST as forgot } from '../../src/pages/api/auth/forgot';
import { POST as verify } from '../../src/pages/api/auth/verify';
import { POST as reset } from '../../src/pages/api/auth/reset';
import { GET as search } from '../../src/pages/api/search/index';
import { GET as geocode } from '../../src/pages/api/geocode/index';
import { GET as listAddresses } from '../../src/pages/api/addresses/index';
import { GET as sampleElevation } from '../../src/pages/api/elevation/sample';
import { GET as toolsChannel } from '../../src/pages/api/tools/channel';
import { GET as toolsPath } from '../../src/pages/api/tools/path';
import { GET as shortlist } from '../../src/pages/api/shortlist/index';
import { MastChangeSchema, MastInputSchema, CellInputSchema, CellChangeSchema } from '../../src/lib/schemas/masts';
import { MastDeleteQuerySchema, MastListQuerySchema, SearchQuerySchema } from '../../src/lib/schemas/mast-query';
import { OperatorChangeSchema, OperatorInputSchema } from '../../src/lib/schemas/operators';
import { CustomerChangeSchema, CustomerInputSchema, CustomerListQuerySchema } from '../../src/lib/schemas/customers';
import { InstallCheckInputSchema, PlanChangeSchema, PlanInputSchema, PlanListQuerySchema } from '../../src/lib/schemas/plans';
import { RegionChangeSchema, RegionInputSchema } from '../../src/lib/schemas/regions';
import { AntennaChangeSchema, AntennaInputSchema, CableChangeSchema, CableInputSchema } from '../../src/lib/schemas/catalogue';
import { NewUserSchema, UserChangeSchema } from '../../src/lib/schemas/users';
import { LoginSchema } from '../../src/lib/schemas/auth';
import { ForgotSchema, SetPasswordSchema, SignupSchema, VerifySchema } from '../../src/lib/schemas/accounts';
import { AddressListQuerySchema, GeocodeQuerySchema } from '../../src/lib/schemas/addresses';
import { ElevationSampleQuerySchema } from '../../src/lib/schemas/elevation';
import { ChannelQuerySchema, PathQuerySchema } from '../../src/lib/schemas/tools';
import { ShortlistQuerySchema } from '../../src/lib/schemas/shortlist';
import { IdParamSchema } from '../../src/lib/schemas/params';
import type { SessionUser } from '../../src/lib/server/session-user';
import { call, type CallResult } from '../helpers/endpoint';
import { testDb, truncateAll } from '../helpers/db';
import { asSessionUser, makeUser } from '../helpers/factories';
import { SEA_SQUARE } from '../helpers/geojson';
import { FEEDER_BODY, PANEL_BODY } from '../helpers/catalogue-bodies';

const RUNS = { numRuns: 15 };
// Tables a request may touch without storing anything of the client's: throttling counters and sessions.
const BOOKKEEPING = new Set(['account_requests', 'login_failures', 'sessions']);

interface Fixture {
  admin: SessionUser;
  operator: string;
  mast: string;
  cell: string;
  customer: string;
  plan: string;
  region: string;
  antenna: string;
  cable: string;
  user: string;
}
let f: Fixture;
let tables: string[];

/** Every application table's row count and content hash, to prove a request stored nothing. */
async function snapshot(): Promise<Record<string, string>> {
  const sql = tables.map((t) => `SELECT '${t}' AS t, md5(coalesce(string_agg(x::text, '|' ORDER BY x::text), '')) AS h FROM "${t}" x`).join(' UNION ALL ');
  const { rows } = await testDb().raw<{ rows: { t: string; h: string }[] }>(sql);
  return Object.fromEntries(rows.map((r) => [r.t, r.h]));
}

function expectErrorShape(res: CallResult) {
  expect(res.status, JSON.stringify(res.body)).toBeGreaterThanOrEqual(400);
  expect(res.status, JSON.stringify(res.body)).toBeLessThan(500);
  expect(res.body).toEqual({ error: expect.objectContaining({ code: expect.any(String), message: expect.any(String) }) });
  expect(Object.keys(res.body.error).every((k) => ['code', 'message', 'fields'].includes(k))).toBe(true);
  if (res.body.error.fields !== undefined) {
    for (const messages of Object.values(res.body.error.fields)) expect(messages).toEqual(expect.arrayContaining([expect.any(String)]));
  }
}

/** The field names a zod object schema declares, through refinements, transforms and defaults. */
function keysOf(schema: ZodTypeAny): string[] {
  let s: ZodTypeAny = schema;
  for (;;) {
    const def = s._def as { typeName: string; schema?: ZodTypeAny; innerType?: ZodTypeAny; in?: ZodTypeAny; shape?: () => Record<string, ZodTypeAny> };
    if (def.typeName === 'ZodObject') return Object.keys(def.shape!());
    const next = def.schema ?? def.innerType ?? def.in;
    if (!next) return [];
    s = next;
  }
}

// Awkward values: wrong types, edges of number ranges, text PostgreSQL refuses (NUL), huge text.
const awkward = fc.oneof(
  fc.jsonValue({ maxDepth: 2 }),
  fc.constantFrom(
    null,
    '',
    ' ',
    '\u0000',
    'a\u0000b',
    '-0',
    'NaN',
    'Infinity',
    '1e309',
    '９',
    '0x10',
    true,
    [],
    {},
    -1,
    0,
    1.5,
    2 ** 53,
    -(2 ** 63),
    1e308,
    -1e308,
  ),
  fc.string({ unit: 'binary', maxLength: 40 }),
  fc.integer({ min: 1, max: 5000 }).map((n) => 'x'.repeat(n)),
);

/** Bodies built from a valid example: a field replaced, dropped or added, or something else entirely. */
function bodies(valid: Record<string, unknown>, schema: ZodTypeAny) {
  const keys = [...new Set([...Object.keys(valid), ...keysOf(schema)])];
  return fc.oneof(
    fc.record({ key: fc.constantFrom(...keys), value: awkward }).map(({ key, value }) => ({ ...valid, [key]: value })),
    fc.constantFrom(...keys).map((key) => Object.fromEntries(Object.entries(valid).filter(([k]) => k !== key))),
    fc.dictionary(fc.oneof(fc.constantFrom(...keys), fc.string({ maxLength: 8 })), awkward, { maxKeys: 6 }),
    fc.jsonValue({ maxDepth: 3 }),
  );
}

interface BodyCase {
  name: string;
  route: APIRoute;
  method: 'POST' | 'PATCH';
  schema: ZodTypeAny;
  valid: () => Record<string, unknown>;
  params?: () => Record<string, string>;
  signedOut?: boolean;
}

const SQUARE = SEA_SQUARE;
const TOKEN = 'A'.repeat(43);

const bodyCases: BodyCase[] = [
  { name: 'POST /api/masts', route: createMast, method: 'POST', schema: MastInputSchema, valid: () => ({ name: 'Probe Hill', lat: -47.2, lon: -128.5 }) },
  {
    name: 'PATCH /api/masts/:id',
    route: patchMast,
    method: 'PATCH',
    schema: MastChangeSchema,
    valid: () => ({ row_version: 1, name: 'Probe Hill 2' }),
    params: () => ({ id: f.mast }),
  },
  {
    name: 'POST /api/masts/:id/cells',
    route: createCell,
    method: 'POST',
    schema: CellInputSchema,
    valid: () => ({ operator_id: f.operator, tech: 'lte', channel: 6300, pci: 101 }),
    params: () => ({ id: f.mast }),
  },
  {
    name: 'PATCH /api/cells/:id',
    route: patchCell,
    method: 'PATCH',
    schema: CellChangeSchema,
    valid: () => ({ row_version: 1, pci: 102 }),
    params: () => ({ id: f.cell }),
  },
  {
    name: 'POST /api/operators',
    route: createOperator,
    method: 'POST',
    schema: OperatorInputSchema,
    valid: () => ({ name: 'Probe Mobile', mcc: '001', mnc: '77' }),
  },
  {
    name: 'PATCH /api/operators/:id',
    route: patchOperator,
    method: 'PATCH',
    schema: OperatorChangeSchema,
    valid: () => ({ name: 'Probe Mobile 2' }),
    params: () => ({ id: f.operator }),
  },
  {
    name: 'POST /api/customers',
    route: createCustomer,
    method: 'POST',
    schema: CustomerInputSchema,
    valid: () => ({ name: 'Probe Customer', address_label: 'Probe Farm', lat: -47.21, lon: -128.51 }),
  },
  {
    name: 'PATCH /api/customers/:id',
    route: patchCustomer,
    method: 'PATCH',
    schema: CustomerChangeSchema,
    valid: () => ({ row_version: 1, name: 'Probe Customer 2' }),
    params: () => ({ id: f.customer }),
  },
  { name: 'POST /api/plans', route: createPlan, method: 'POST', schema: PlanInputSchema, valid: () => ({ customer_id: f.customer }) },
  {
    name: 'PATCH /api/plans/:id',
    route: patchPlan,
    method: 'PATCH',
    schema: PlanChangeSchema,
    valid: () => ({ row_version: 1, notes: 'Probe' }),
    params: () => ({ id: f.plan }),
  },
  {
    name: 'POST /api/plans/:id/checks',
    route: addCheck,
    method: 'POST',
    schema: InstallCheckInputSchema,
    valid: () => ({ phase: 'before', readings: [{ pci: 101, rsrp_dbm: -110 }] }),
    params: () => ({ id: f.plan }),
  },
  { name: 'POST /api/regions', route: createRegion, method: 'POST', schema: RegionInputSchema, valid: () => ({ name: 'Probe Fells', geometry: SQUARE }) },
  {
    name: 'PATCH /api/regions/:id',
    route: patchRegion,
    method: 'PATCH',
    schema: RegionChangeSchema,
    valid: () => ({ name: 'Probe Fells 2' }),
    params: () => ({ id: f.region }),
  },
  {
    name: 'POST /api/catalogue/antennas',
    route: createAntenna,
    method: 'POST',
    schema: AntennaInputSchema,
    valid: () => ({ ...PANEL_BODY, name: 'Probe panel' }),
  },
  {
    name: 'PATCH /api/catalogue/antennas/:id',
    route: patchAntenna,
    method: 'PATCH',
    schema: AntennaChangeSchema,
    valid: () => ({ ports: 4 }),
    params: () => ({ id: f.antenna }),
  },
  {
    name: 'POST /api/catalogue/cables',
    route: createCable,
    method: 'POST',
    schema: CableInputSchema,
    valid: () => ({ ...FEEDER_BODY, name: 'Probe feeder' }),
  },
  {
    name: 'PATCH /api/catalogue/cables/:id',
    route: patchCable,
    method: 'PATCH',
    schema: CableChangeSchema,
    valid: () => ({ connectors: 3 }),
    params: () => ({ id: f.cable }),
  },
  {
    name: 'POST /api/users',
    route: inviteUser,
    method: 'POST',
    schema: NewUserSchema,
    valid: () => ({ email: 'probe@example.test', name: 'Probe', role: 'planner' }),
  },
  {
    name: 'PATCH /api/users/:id',
    route: patchUser,
    method: 'PATCH',
    schema: UserChangeSchema,
    valid: () => ({ name: 'Probe 2' }),
    params: () => ({ id: f.user }),
  },
  {
    name: 'POST /api/auth/login',
    route: login,
    method: 'POST',
    schema: LoginSchema,
    valid: () => ({ email: 'nobody@example.test', password: 'not the password' }),
    signedOut: true,
  },
  {
    name: 'POST /api/auth/signup',
    route: signup,
    method: 'POST',
    schema: SignupSchema,
    valid: () => ({ name: 'Probe', email: 'new@example.test', password: 'a long enough password' }),
    signedOut: true,
  },
  { name: 'POST /api/auth/forgot', route: forgot, method: 'POST', schema: ForgotSchema, valid: () => ({ email: 'nobody@example.test' }), signedOut: true },
  { name: 'POST /api/auth/verify', route: verify, method: 'POST', schema: VerifySchema, valid: () => ({ token: TOKEN }), signedOut: true },
  {
    name: 'POST /api/auth/reset',
    route: reset,
    method: 'POST',
    schema: SetPasswordSchema,
    valid: () => ({ token: TOKEN, password: 'a long enough password' }),
    signedOut: true,
  },
];

interface QueryCase {
  name: string;
  route: APIRoute;
  schema: ZodTypeAny;
  params?: () => Record<string, string>;
  method?: 'GET' | 'DELETE';
}

const queryCases: QueryCase[] = [
  { name: 'GET /api/masts', route: listMasts, schema: MastListQuerySchema },
  { name: 'DELETE /api/masts/:id', route: deleteMast, schema: MastDeleteQuerySchema, params: () => ({ id: f.mast }), method: 'DELETE' },
  { name: 'GET /api/search', route: search, schema: SearchQuerySchema },
  { name: 'GET /api/customers', route: listCustomers, schema: CustomerListQuerySchema },
  { name: 'GET /api/plans', route: listPlans, schema: PlanListQuerySchema },
  { name: 'GET /api/geocode', route: geocode, schema: GeocodeQuerySchema },
  { name: 'GET /api/addresses', route: listAddresses, schema: AddressListQuerySchema },
  { name: 'GET /api/elevation/sample', route: sampleElevation, schema: ElevationSampleQuerySchema },
  { name: 'GET /api/tools/channel', route: toolsChannel, schema: ChannelQuerySchema },
  { name: 'GET /api/tools/path', route: toolsPath, schema: PathQuerySchema },
  { name: 'GET /api/shortlist', route: shortlist, schema: ShortlistQuerySchema },
];

const queryValue = fc.oneof(
  fc.string({ maxLength: 12 }),
  fc.constantFrom('', '-1', '0', '1', '1.5', '1e309', 'NaN', '-0', '99999999999999999999', '\u0000', 'lte', 'nr', '52.2,0.12', '-47.2', '-128.5', '6300'),
  fc.double().map(String),
);

beforeAll(async () => {
  await truncateAll();
  const db = testDb();
  const { rows } = await db.raw<{ rows: { tablename: string }[] }>(
    `SELECT tablename FROM pg_tables WHERE schemaname = 'public' AND tablename NOT LIKE 'knex_%' AND tablename <> 'spatial_ref_sys'`,
  );
  tables = rows
    .map((r) => r.tablename)
    .filter((t) => !BOOKKEEPING.has(t))
    .sort();
  const admin = asSessionUser(await makeUser('admin'));
  const other = await makeUser('planner');
  const made = async (route: APIRoute, json: unknown, params?: Record<string, string>) => {
    const res = await call(route, { user: admin, json, params });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    return String(res.body.id);
  };
  const operator = await made(createOperator, { name: 'Fixture Mobile', mcc: '001', mnc: '88' });
  const mast = await made(createMast, { name: 'Fixture Hill', lat: -47.2, lon: -128.5 });
  const cell = await made(createCell, { operator_id: operator, tech: 'lte', channel: 6300, pci: 7 }, { id: mast });
  const customer = await made(createCustomer, { name: 'Fixture Customer', address_label: 'Fixture Farm', lat: -47.21, lon: -128.51 });
  const plan = await made(createPlan, { customer_id: customer });
  const region = await made(createRegion, { name: 'Fixture Fells', geometry: SQUARE });
  const antenna = await made(createAntenna, {
    name: 'Fixture panel',
    kind: 'directional',
    ports: 2,
    horizontal_beamwidth_deg: 40,
    gain_table: [{ freq_mhz: 700, gain_dbi: 7 }],
  });
  const cable = await made(createCable, { name: 'Fixture feeder', loss_table: [{ freq_mhz: 800, loss_db_per_m: 0.12 }] });
  f = { admin, operator, mast, cell, customer, plan, region, antenna, cable, user: other.id };
});

describe('endpoint bodies (property-based)', () => {
  it.each(bodyCases.map((c) => [c.name, c] as const))('%s: rejected input is a 4xx error body and stores nothing', async (_name, c) => {
    await fc.assert(
      fc.asyncProperty(
        bodies(c.valid(), c.schema).filter((body) => !c.schema.safeParse(body).success),
        async (body) => {
          const before = await snapshot();
          const res = await call(c.route, { method: c.method, user: c.signedOut ? null : f.admin, params: c.params?.(), json: body });
          expectErrorShape(res);
          expect(await snapshot()).toEqual(before);
        },
      ),
      RUNS,
    );
  });

  it.each(bodyCases.map((c) => [c.name, c] as const))('%s: no input gives a 5xx', async (_name, c) => {
    await fc.assert(
      fc.asyncProperty(bodies(c.valid(), c.schema), async (body) => {
        const res = await call(c.route, { method: c.method, user: c.signedOut ? null : f.admin, params: c.params?.(), json: body });
        expect(res.status, JSON.stringify(res.body)).toBeLessThan(500);
        if (res.status >= 400) expectErrorShape(res);
      }),
      RUNS,
    );
  });

  it.each(bodyCases.filter((c) => !c.signedOut).map((c) => [c.name, c] as const))('%s: a body that is not JSON is a 4xx', async (_name, c) => {
    await fc.assert(
      fc.asyncProperty(
        fc.string({ maxLength: 40 }).filter((text) => !isJsonObject(text)),
        async (text) => {
          const res = await call(c.route, {
            method: c.method,
            user: f.admin,
            params: c.params?.(),
            body: text,
            headers: { 'content-type': 'application/json' },
          });
          expectErrorShape(res);
        },
      ),
      { numRuns: 10 },
    );
  });
});

function isJsonObject(text: string): boolean {
  try {
    const v: unknown = JSON.parse(text);
    return v !== null && typeof v === 'object' && !Array.isArray(v);
  } catch {
    return false;
  }
}

describe('query strings (property-based)', () => {
  it.each(queryCases.map((c) => [c.name, c] as const))('%s: never a 5xx; what the schema rejects is a 400 with fields', async (_name, c) => {
    const keys = keysOf(c.schema);
    await fc.assert(
      fc.asyncProperty(fc.dictionary(fc.oneof(fc.constantFrom(...keys), fc.string({ maxLength: 6 })), queryValue, { maxKeys: 5 }), async (query) => {
        const url = `/api/probe?${new URLSearchParams(query)}`;
        const before = await snapshot();
        const res = await call(c.route, { method: c.method ?? 'GET', user: f.admin, params: c.params?.(), url });
        expect(res.status, JSON.stringify(res.body)).toBeLessThan(500);
        if (!c.schema.safeParse(Object.fromEntries(new URL(url, 'http://x').searchParams)).success) {
          expect(res.status).toBe(400);
          expectErrorShape(res);
          expect(res.body.error.fields).toBeDefined();
          expect(await snapshot()).toEqual(before);
        }
      }),
      RUNS,
    );
  });
});

describe('route ids (property-based)', () => {
  const idRoutes: Array<[string, APIRoute]> = [
    ['GET /api/masts/:id', getMast],
    ['GET /api/customers/:id', getCustomer],
    ['GET /api/plans/:id', getPlan],
  ];
  it.each(idRoutes)('%s: any id is a 400 (malformed) or 404 (unknown), never a 5xx', async (_name, route) => {
    await fc.assert(
      fc.asyncProperty(fc.oneof(fc.string({ maxLength: 24 }), fc.bigInt({ min: 0n, max: 10n ** 20n }).map(String)), async (id) => {
        const res = await call(route, { user: f.admin, params: { id } });
        if (String(res.status).startsWith('2')) return; // one of the fixture's own ids
        expectErrorShape(res);
        expect(res.status).toBe(IdParamSchema.safeParse({ id }).success ? 404 : 400);
      }),
      { numRuns: 50 },
    );
  });
});
