import { beforeEach, describe, expect, it } from 'vitest';
import { GET as listMasts, POST as createMast } from '../../src/pages/api/masts/index';
import { GET as getMast, PATCH as patchMast, DELETE as deleteMast } from '../../src/pages/api/masts/[id]';
import { GET as listCells, POST as createCell } from '../../src/pages/api/masts/[id]/cells';
import { GET as getCell, PATCH as patchCell, DELETE as deleteCell } from '../../src/pages/api/cells/[id]';
import { GET as search } from '../../src/pages/api/search/index';
import { createOperator } from '../../src/lib/server/repos/operators';
import { createMast as insertMast } from '../../src/lib/server/repos/masts';
import { createCell as insertCell } from '../../src/lib/server/repos/cells';
import { CellInputSchema, MastInputSchema } from '../../src/lib/schemas/masts';
import { call } from '../helpers/endpoint';
import { testDb, truncateAll } from '../helpers/db';
import { asSessionUser, makeUser } from '../helpers/factories';

// Small invented fixture on the demo island's waters: two masts near (-47.2, -128.5), one far away.
interface Fixture {
  op1: string;
  op2: string;
  hill: string;
  planned: string;
  far: string;
  hillB20: string;
}

async function makeOperator(name: string, mnc: string) {
  return createOperator(testDb(), { name, mcc: '001', mnc }, null);
}

async function makeMast(body: Record<string, unknown>) {
  return insertMast(testDb(), MastInputSchema.parse(body), null);
}

async function makeCell(mastId: string, body: Record<string, unknown>) {
  return insertCell(testDb(), mastId, CellInputSchema.parse(body), null);
}

async function buildFixture(): Promise<Fixture> {
  const op1 = (await makeOperator('Test Mobile A', '01')).id;
  const op2 = (await makeOperator('Test Mobile B', '02')).id;
  const hill = (await makeMast({ name: 'Test Hill', reference: 'TST-001', lat: -47.2, lon: -128.5, structure_type: 'lattice_tower' })).id;
  const planned = (await makeMast({ name: 'Test Planned', lat: -47.25, lon: -128.55, status: 'planned' })).id;
  const far = (await makeMast({ name: 'Far Station', lat: -40, lon: 170, status: 'decommissioned' })).id;
  // 3GPP TS 36.101 Table 5.7.3-1: EARFCN 6300 is B20 at 806.0 MHz.
  const hillB20 = (await makeCell(hill, { operator_id: op1, tech: 'lte', channel: 6300, pci: 101, sector_azimuth_deg: 0 })).id;
  await makeCell(hill, { operator_id: op2, tech: 'nr', band: 'n78', channel: 641280, pci: 900, sector_azimuth_deg: 120 });
  await makeCell(far, { operator_id: op1, tech: 'lte', band: 'B3', channel: 1300, pci: 5 });
  return { op1, op2, hill, planned, far, hillB20 };
}

const ids = (body: { features: Array<{ properties: { id: string } }> }) => body.features.map((f) => f.properties.id).sort();

describe('masts API: list', () => {
  let f: Fixture;
  let planner: ReturnType<typeof asSessionUser>;
  beforeEach(async () => {
    await truncateAll();
    f = await buildFixture();
    planner = asSessionUser(await makeUser('planner'));
  });

  it('answers 401 signed out, with the error body', async () => {
    const res = await call(listMasts, { url: '/api/masts' });
    expect(res.status).toBe(401);
    expect(res.body).toEqual({ error: { code: 'UNAUTHORIZED', message: expect.any(String) } });
  });

  it('returns a GeoJSON FeatureCollection (RFC 7946: lon before lat) with a summary per mast', async () => {
    const res = await call(listMasts, { user: planner, url: '/api/masts' });
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toContain('application/geo+json');
    expect(res.body.type).toBe('FeatureCollection');
    expect(res.body.truncated).toBe(false);
    const hill = res.body.features.find((x: { properties: { id: string } }) => x.properties.id === f.hill);
    expect(hill).toMatchObject({
      type: 'Feature',
      id: Number(f.hill),
      geometry: { type: 'Point', coordinates: [-128.5, -47.2] },
      properties: {
        name: 'Test Hill',
        reference: 'TST-001',
        status: 'active',
        structure_type: 'lattice_tower',
        bands: ['B20', 'n78'],
        techs: ['lte', 'nr'],
        cell_count: 2,
      },
    });
    expect(hill.properties.operators).toEqual([
      { id: f.op1, name: 'Test Mobile A', colour: '#0072b2' },
      { id: f.op2, name: 'Test Mobile B', colour: '#e69f00' },
    ]);
    const planned = res.body.features.find((x: { properties: { id: string } }) => x.properties.id === f.planned);
    expect(planned.properties).toMatchObject({ operators: [], bands: [], techs: [], cell_count: 0 });
  });

  it('keeps to the bbox', async () => {
    const res = await call(listMasts, { user: planner, url: '/api/masts?bbox=-129,-47.5,-128,-47' });
    expect(ids(res.body)).toEqual([f.hill, f.planned].sort());
  });

  it.each([
    ['operator=OP2', ['hill']],
    ['band=B20', ['hill']],
    ['band=n78,B3', ['far', 'hill']],
    ['band=b3', ['far']],
    ['tech=nr', ['hill']],
    ['status=planned', ['planned']],
    ['status=active,decommissioned', ['far', 'hill']],
    ['operator=OP1&status=decommissioned', ['far']],
    // One cell must match every cell filter: operator B has no B20 cell.
    ['operator=OP2&band=B20', []],
  ])('filters by %s', async (query, expected) => {
    const q = query.replace('OP1', f.op1).replace('OP2', f.op2);
    const res = await call(listMasts, { user: planner, url: `/api/masts?${q}` });
    expect(res.status).toBe(200);
    expect(ids(res.body)).toEqual(expected.map((k) => f[k as keyof Fixture]).sort());
  });

  it('stops at the limit and says so', async () => {
    const res = await call(listMasts, { user: planner, url: '/api/masts?limit=2' });
    expect(res.body.features).toHaveLength(2);
    expect(res.body.truncated).toBe(true);
  });

  it.each([
    ['bbox=1,2,3', 'bbox'],
    ['bbox=-129,-47.5,-128,91', 'bbox'],
    ['bbox=-129,-47,-128,-47.5', 'bbox'],
    ['bbox=a,b,c,d', 'bbox'],
    ['status=gone', 'status'],
    ['tech=wimax', 'tech'],
    ['band=B99', 'band'],
    ['operator=abc', 'operator'],
    ['limit=0', 'limit'],
  ])('answers 400 with fields for %s', async (query, field) => {
    const res = await call(listMasts, { user: planner, url: `/api/masts?${query}` });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('BAD_REQUEST');
    expect(Object.keys(res.body.error.fields)).toEqual([field]);
  });
});

describe('masts API: one mast', () => {
  let f: Fixture;
  beforeEach(async () => {
    await truncateAll();
    f = await buildFixture();
  });

  it('returns the mast with its cells, operator names and up to 20 recent readings', async () => {
    const contributor = asSessionUser(await makeUser('contributor'));
    const db = testDb();
    const start = Date.UTC(2026, 9, 1);
    await db('readings').insert(
      Array.from({ length: 25 }, (_, i) => ({
        taken_at: new Date(start + i * 60_000),
        geom: db.raw('ST_SetSRID(ST_MakePoint(?, ?), 4326)', [-128.51, -47.21]),
        tech: 'lte',
        channel: 6300,
        pci: 101,
        rsrp_dbm: -90 - i,
        cell_id: f.hillB20,
        device: 'test-kit',
        source: 'test',
      })),
    );
    const res = await call(getMast, { user: contributor, params: { id: f.hill } });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ id: f.hill, name: 'Test Hill', lat: -47.2, lon: -128.5, status: 'active', row_version: 1 });
    expect(res.body.operators.map((o: { name: string }) => o.name)).toEqual(['Test Mobile A', 'Test Mobile B']);
    expect(res.body.cells).toHaveLength(2);
    expect(res.body.cells[0]).toMatchObject({
      tech: 'lte',
      band: 'B20',
      channel: 6300,
      dl_mhz: 806,
      pci: 101,
      rs_power_dbm: 15.2,
      operator: { name: 'Test Mobile A' },
    });
    // NR-ARFCN 641280 → 3619.2 MHz (TS 38.104 §5.4.2.1).
    expect(res.body.cells[1]).toMatchObject({ tech: 'nr', band: 'n78', channel: 641280, dl_mhz: 3619.2, operator: { name: 'Test Mobile B' } });
    expect(res.body.recent_readings).toHaveLength(20);
    expect(res.body.recent_readings[0]).toMatchObject({ rsrp_dbm: -114, cell_id: f.hillB20, lat: -47.21, lon: -128.51 });
    expect(res.body.recent_readings[19].rsrp_dbm).toBe(-95);
  });

  it('answers 404 for an unknown mast and 400 for a malformed id', async () => {
    const user = asSessionUser(await makeUser('surveyor'));
    const missing = await call(getMast, { user, params: { id: '999999' } });
    expect(missing.status).toBe(404);
    expect(missing.body.error.code).toBe('NOT_FOUND');
    const bad = await call(getMast, { user, params: { id: 'abc' } });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields.id).toBeDefined();
  });

  it('answers 401 signed out', async () => {
    expect((await call(getMast, { params: { id: f.hill } })).status).toBe(401);
  });
});

describe('masts API: writes', () => {
  beforeEach(truncateAll);

  const NEW_MAST = { name: 'New Mast', reference: 'NEW-1', lat: -47.22, lon: -128.45, structure_type: 'monopole', structure_height_m: 25 };

  it.each(['planner', 'surveyor', 'contributor'] as const)('refuses a %s (403) and changes nothing', async (role) => {
    const user = asSessionUser(await makeUser(role));
    const res = await call(createMast, { user, json: NEW_MAST });
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe('FORBIDDEN');
    expect(await testDb()('masts').count('* as n').first()).toEqual({ n: '0' });
  });

  it('answers 401 signed out', async () => {
    expect((await call(createMast, { json: NEW_MAST })).status).toBe(401);
  });

  it.each(['admin', 'reviewer'] as const)('lets a %s create, update and delete a mast, each audited', async (role) => {
    const user = asSessionUser(await makeUser(role));
    const created = await call(createMast, { user, json: NEW_MAST });
    expect(created.status).toBe(201);
    expect(created.body).toMatchObject({ name: 'New Mast', status: 'active', source: 'manual', row_version: 1, created_by: user.id, structure_height_m: 25 });
    const id = created.body.id;

    const patched = await call(patchMast, {
      method: 'PATCH',
      user,
      params: { id },
      json: { row_version: 1, status: 'decommissioned', lat: -47.23, lon: -128.46 },
    });
    expect(patched.status).toBe(200);
    expect(patched.body).toMatchObject({ status: 'decommissioned', lat: -47.23, lon: -128.46, row_version: 2, updated_by: user.id });

    const deleted = await call(deleteMast, { method: 'DELETE', user, params: { id }, url: `/api/masts/${id}?row_version=2` });
    expect(deleted.status).toBe(204);
    expect((await call(getMast, { user, params: { id } })).status).toBe(404);

    const audit = await testDb()('audit_log').where({ entity: 'mast', entity_id: id }).orderBy('id');
    expect(audit.map((a) => a.action)).toEqual(['create', 'update', 'delete']);
    expect(audit[1].before.status).toBe('active');
    expect(audit[1].after.status).toBe('decommissioned');
  });

  it('answers 409 CONFLICT on a stale row_version and keeps the newer change', async () => {
    const admin = asSessionUser(await makeUser('admin'));
    const reviewer = asSessionUser(await makeUser('reviewer'));
    const { id } = (await call(createMast, { user: admin, json: NEW_MAST })).body;
    expect((await call(patchMast, { method: 'PATCH', user: admin, params: { id }, json: { row_version: 1, name: 'First edit' } })).status).toBe(200);
    const stale = await call(patchMast, { method: 'PATCH', user: reviewer, params: { id }, json: { row_version: 1, name: 'Second edit' } });
    expect(stale.status).toBe(409);
    expect(stale.body.error.code).toBe('CONFLICT');
    expect((await call(getMast, { user: admin, params: { id } })).body.name).toBe('First edit');
    const staleDelete = await call(deleteMast, { method: 'DELETE', user: reviewer, params: { id }, url: `/api/masts/${id}?row_version=1` });
    expect(staleDelete.status).toBe(409);
    expect(await testDb()('masts').where({ id }).first()).toBeDefined();
  });

  it.each([
    [{ ...NEW_MAST, lat: 91 }, 'lat'],
    [{ ...NEW_MAST, lon: -181 }, 'lon'],
    [{ ...NEW_MAST, status: 'gone' }, 'status'],
    [{ ...NEW_MAST, structure_type: 'tree' }, 'structure_type'],
    [{ ...NEW_MAST, name: '  ' }, 'name'],
    [{ ...NEW_MAST, structure_height_m: -3 }, 'structure_height_m'],
  ])('answers 400 with fields for bad input (%#)', async (body, field) => {
    const admin = asSessionUser(await makeUser('admin'));
    const res = await call(createMast, { user: admin, json: body });
    expect(res.status).toBe(400);
    expect(res.body.error.fields[field]).toBeDefined();
  });

  it('needs row_version to update, and something to change', async () => {
    const admin = asSessionUser(await makeUser('admin'));
    const { id } = (await call(createMast, { user: admin, json: NEW_MAST })).body;
    const noVersion = await call(patchMast, { method: 'PATCH', user: admin, params: { id }, json: { name: 'x' } });
    expect(noVersion.status).toBe(400);
    expect(noVersion.body.error.fields.row_version).toBeDefined();
    const nothing = await call(patchMast, { method: 'PATCH', user: admin, params: { id }, json: { row_version: 1 } });
    expect(nothing.status).toBe(400);
    const unknown = await call(patchMast, { method: 'PATCH', user: admin, params: { id: '424242' }, json: { row_version: 1, name: 'x' } });
    expect(unknown.status).toBe(404);
  });

  it('refuses a duplicate reference with 409', async () => {
    const admin = asSessionUser(await makeUser('admin'));
    await call(createMast, { user: admin, json: NEW_MAST });
    const dup = await call(createMast, { user: admin, json: { ...NEW_MAST, name: 'Other', reference: 'new-1' } });
    expect(dup.status).toBe(409);
  });
});

describe('cells API', () => {
  let f: Fixture;
  let admin: ReturnType<typeof asSessionUser>;
  beforeEach(async () => {
    await truncateAll();
    f = await buildFixture();
    admin = asSessionUser(await makeUser('admin'));
  });

  it('lists a mast’s cells and answers 404 for an unknown mast', async () => {
    const user = asSessionUser(await makeUser('planner'));
    const res = await call(listCells, { user, params: { id: f.hill } });
    expect(res.status).toBe(200);
    expect(res.body.total).toBe(2);
    expect((await call(listCells, { user, params: { id: '999999' } })).status).toBe(404);
  });

  it('creates a cell, deriving band and downlink MHz from the channel (3GPP TS 36.101 Table 5.7.3-1)', async () => {
    const res = await call(createCell, {
      user: admin,
      params: { id: f.planned },
      json: { operator_id: Number(f.op1), tech: 'lte', channel: 1300, pci: 42, sector_azimuth_deg: 240 },
    });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ mast_id: f.planned, band: 'B3', channel: 1300, dl_mhz: 1815, pci: 42, sector_azimuth_deg: 240 });
    const audit = await testDb()('audit_log').where({ entity: 'cell', entity_id: res.body.id }).first();
    expect(audit.action).toBe('create');
  });

  it.each([
    // EARFCN 1300 is B3, not B20 (TS 36.101 Table 5.7.3-1).
    [{ tech: 'lte', band: 'B20', channel: 1300 }, 'channel'],
    // LTE PCI 0–503 (TS 36.211 §6.11); NR 0–1007 (TS 38.211 §7.4.2.1).
    [{ tech: 'lte', channel: 6300, pci: 504 }, 'pci'],
    [{ tech: 'nr', band: 'n78', channel: 641280, pci: 1008 }, 'pci'],
    [{ tech: 'lte', channel: 6300, sector_azimuth_deg: 360 }, 'sector_azimuth_deg'],
    [{ tech: 'lte', channel: 6300, sector_azimuth_deg: -1 }, 'sector_azimuth_deg'],
    [{ tech: 'lte', band: 'B99', channel: 6300 }, 'band'],
    [{ tech: 'lte', channel: 70000 }, 'channel'],
    [{ tech: '5g', channel: 6300 }, 'tech'],
    [{ tech: 'lte', channel: 6300, operator_id: 999999 }, 'operator_id'],
  ])('answers 400 with fields for a bad cell (%#)', async (body, field) => {
    const res = await call(createCell, { user: admin, params: { id: f.hill }, json: { operator_id: f.op1, ...body } });
    expect(res.status).toBe(400);
    expect(res.body.error.fields[field]).toBeDefined();
  });

  it('accepts an NR PCI up to 1007', async () => {
    const res = await call(createCell, { user: admin, params: { id: f.hill }, json: { operator_id: f.op2, tech: 'nr', channel: 641280, pci: 1007 } });
    expect(res.status).toBe(201);
    expect(res.body.band).toBe('n78');
  });

  it('answers 404 when adding a cell to an unknown mast, 403 for a planner', async () => {
    expect((await call(createCell, { user: admin, params: { id: '999999' }, json: { operator_id: f.op1, tech: 'lte', channel: 6300 } })).status).toBe(404);
    const planner = asSessionUser(await makeUser('planner'));
    expect((await call(createCell, { user: planner, params: { id: f.hill }, json: { operator_id: f.op1, tech: 'lte', channel: 6300 } })).status).toBe(403);
  });

  it('updates a cell and checks the whole cell again; a new channel re-derives the band', async () => {
    const moved = await call(patchCell, { method: 'PATCH', user: admin, params: { id: f.hillB20 }, json: { channel: 3050, row_version: 1 } });
    expect(moved.status).toBe(200);
    // EARFCN 3050 → B7, 2650.0 MHz (3GPP TS 36.101 Table 5.7.3-1).
    expect(moved.body).toMatchObject({ band: 'B7', channel: 3050, dl_mhz: 2650, pci: 101 });
    const bad = await call(patchCell, { method: 'PATCH', user: admin, params: { id: f.hillB20 }, json: { band: 'B20', row_version: 2 } });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields.channel).toBeDefined();
    const cleared = await call(patchCell, { method: 'PATCH', user: admin, params: { id: f.hillB20 }, json: { pci: null, row_version: 2 } });
    expect(cleared.body.pci).toBeNull();
    expect((await call(getCell, { user: admin, params: { id: f.hillB20 } })).body.band).toBe('B7');
  });

  it('deletes a cell (204), then answers 404', async () => {
    expect((await call(deleteCell, { method: 'DELETE', user: admin, params: { id: f.hillB20 } })).status).toBe(204);
    expect((await call(getCell, { user: admin, params: { id: f.hillB20 } })).status).toBe(404);
    expect((await call(deleteCell, { method: 'DELETE', user: admin, params: { id: f.hillB20 } })).status).toBe(404);
  });
});

describe('search API', () => {
  beforeEach(truncateAll);

  it('finds masts by name or reference and places by name, with lat/lon', async () => {
    await buildFixture();
    const db = testDb();
    await db('basemap_places').insert({ name: 'Hillmouth', kind: 'village', rank: 2, geom: db.raw('ST_SetSRID(ST_MakePoint(?, ?), 4326)', [-128.4, -47.3]) });
    const user = asSessionUser(await makeUser('contributor'));
    const res = await call(search, { user, url: '/api/search?q=hil' });
    expect(res.status).toBe(200);
    expect(res.body.items).toEqual([
      { kind: 'mast', id: expect.any(String), name: 'Test Hill', detail: 'TST-001', lat: -47.2, lon: -128.5 },
      { kind: 'place', id: expect.any(String), name: 'Hillmouth', detail: 'village', lat: -47.3, lon: -128.4 },
    ]);
    const byRef = await call(search, { user, url: '/api/search?q=tst-0' });
    expect(byRef.body.items.map((i: { name: string }) => i.name)).toEqual(['Test Hill']);
    const literal = await call(search, { user, url: '/api/search?q=%25' });
    expect(literal.body.items).toEqual([]);
  });

  it('answers 400 without a query and 401 signed out', async () => {
    const user = asSessionUser(await makeUser('planner'));
    const res = await call(search, { user, url: '/api/search?q=' });
    expect(res.status).toBe(400);
    expect(res.body.error.fields.q).toBeDefined();
    expect((await call(search, { url: '/api/search?q=x' })).status).toBe(401);
  });
});
