import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { config } from '../../src/lib/server/config';

// A small import limit (IMPORT_MAX_BYTES), so the 413 is reached with a few MB.
const LIMIT = 2 * 1024 * 1024;
const configuredLimit = config.importMaxBytes;
beforeAll(() => {
  config.importMaxBytes = LIMIT;
});
afterAll(() => {
  config.importMaxBytes = configuredLimit;
});
import { POST as importAddresses } from '../../src/pages/api/addresses/import';
import { GET as listAddresses } from '../../src/pages/api/addresses/index';
import { ROLES } from '../../src/lib/domain/roles';
import { parseAddressCsv } from '../../src/lib/schemas/addresses';
import { call } from '../helpers/endpoint';
import { testDb, truncateAll } from '../helpers/db';
import { asSessionUser, makeUser } from '../helpers/factories';

const GOOD = [
  'label,postcode,lat,lon',
  'Alder Farm,kv3 2pl,-47.21,-128.52',
  '"Rowan Cottage, Fell Road",KV3 4QT,-47.1934,-128.4411',
  '3 Quay Row,,-47.25,-128.6',
].join('\n');

function multipart(content: string | Uint8Array<ArrayBuffer>, name = 'gazetteer.csv', type = 'text/csv'): { body: FormData } {
  const form = new FormData();
  form.append('file', new File([content], name, { type }));
  return { body: form };
}

async function count(): Promise<number> {
  const row = await testDb()('addresses').count('* as n').first();
  return Number(row!.n);
}

describe('gazetteer CSV parsing', () => {
  it('reports the physical line where each bad row starts', () => {
    const csv = ['label,postcode,lat,lon', 'Good,A1,1,2', '', '"Two', 'lines",A2,95,2', 'Short,A3,1', 'Good,a1,1,2', 'x,A4,north,2'].join('\r\n');
    const r = parseAddressCsv(csv);
    expect(r.rows.map((x) => x.line)).toEqual([2]);
    expect(r.errors).toEqual([
      { line: 4, messages: ['lat must be between -90 and 90'] },
      { line: 6, messages: ['expected 4 values, found 3', 'lon is empty'] },
      { line: 7, messages: ['same label and postcode as line 2'] },
      { line: 8, messages: ['lat must be a number in decimal degrees'] },
    ]);
  });

  it('accepts columns in any order and case, postcode optional', () => {
    const r = parseAddressCsv('\uFEFFLon,LAT,Label\n-1.5,52.25,Home');
    expect(r.errors).toEqual([]);
    expect(r.rows).toEqual([{ label: 'Home', postcode: null, lat: 52.25, lon: -1.5, line: 2 }]);
  });

  it('names missing columns and empty files', () => {
    expect(parseAddressCsv('label,postcode\nA,B').fileErrors[0]).toMatch(/^Missing columns: lat, lon/);
    expect(parseAddressCsv('').fileErrors[0]).toMatch(/empty/);
    expect(parseAddressCsv('label,lat,lon\n').fileErrors).toEqual(['The file has a header but no addresses']);
  });
});

describe('addresses API', () => {
  beforeEach(truncateAll);

  it('answers 401 when signed out', async () => {
    expect((await call(importAddresses, { ...multipart(GOOD) })).status).toBe(401);
    expect((await call(listAddresses)).status).toBe(401);
  });

  it.each(ROLES.filter((r) => r !== 'admin'))('does not let a %s import (403)', async (role) => {
    const user = asSessionUser(await makeUser(role));
    const res = await call(importAddresses, { user, ...multipart(GOOD) });
    expect(res.status).toBe(403);
    expect(await count()).toBe(0);
    expect((await call(listAddresses, { user })).status).toBe(200);
  });

  it('imports a multipart upload, audited with the file checksum', async () => {
    const admin = asSessionUser(await makeUser('admin'));
    const res = await call(importAddresses, { user: admin, ...multipart(GOOD) });
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ rows: 3, inserted: 3, updated: 0, unchanged: 0 });
    const rows = await testDb()('addresses').orderBy('label').select('label', 'postcode', testDb().raw('ST_Y(geom) AS lat'), testDb().raw('ST_X(geom) AS lon'));
    expect(rows).toEqual([
      { label: '3 Quay Row', postcode: null, lat: -47.25, lon: -128.6 },
      { label: 'Alder Farm', postcode: 'KV3 2PL', lat: -47.21, lon: -128.52 },
      { label: 'Rowan Cottage, Fell Road', postcode: 'KV3 4QT', lat: -47.1934, lon: -128.4411 },
    ]);
    const audit = await testDb()('audit_log').where({ entity: 'addresses', action: 'import' }).first();
    expect(audit.user_id).toBe(admin.id);
    expect(audit.after).toMatchObject({ file: 'gazetteer.csv', rows: 3, inserted: 3, bytes: GOOD.length });
    expect(audit.after.sha256).toMatch(/^[0-9a-f]{64}$/);
  });

  it('reports an identical re-import as unchanged, not moved', async () => {
    const admin = asSessionUser(await makeUser('admin'));
    await call(importAddresses, { user: admin, ...multipart(GOOD) });
    const before = await testDb()('addresses').orderBy('id').select('id', 'updated_at');
    const again = await call(importAddresses, { user: admin, ...multipart(GOOD) });
    expect(again.body).toEqual({ rows: 3, inserted: 0, updated: 0, unchanged: 3 });
    expect(await testDb()('addresses').orderBy('id').select('id', 'updated_at')).toEqual(before);
  });

  it('imports a text/csv body and moves known addresses instead of duplicating them', async () => {
    const admin = asSessionUser(await makeUser('admin'));
    await call(importAddresses, { user: admin, body: GOOD, headers: { 'content-type': 'text/csv' } });
    const again = await call(importAddresses, {
      user: admin,
      body: 'label,postcode,lat,lon\nalder farm,KV32PL,-47.3,-128.7\nNew Barn,KV9 1AA,-47.4,-128.8',
      headers: { 'content-type': 'text/csv; charset=utf-8' },
    });
    expect(again.body).toEqual({ rows: 2, inserted: 1, updated: 1, unchanged: 0 });
    expect(await count()).toBe(4);
    const moved = await testDb()('addresses').where({ postcode: 'KV32PL' }).first(testDb().raw('ST_Y(geom) AS lat'), 'label');
    expect(moved).toEqual({ lat: -47.3, label: 'alder farm' });
  });

  it('imports nothing when any row is bad, and lists each bad line (422)', async () => {
    const admin = asSessionUser(await makeUser('admin'));
    const csv = `${GOOD}\nBroken,KV1 1AA,-47.2,-200\n,KV1 1AB,-47.2,-128.5`;
    const res = await call(importAddresses, { user: admin, ...multipart(csv) });
    expect(res.status).toBe(422);
    expect(res.body.error.code).toBe('UNPROCESSABLE_CONTENT');
    expect(res.body.error.message).toBe('2 rows have problems; nothing was imported. Fix them and import the file again');
    expect(res.body.error.fields).toEqual({ 'line 5': ['lon must be between -180 and 180'], 'line 6': ['label is empty'] });
    expect(await count()).toBe(0);
    expect(await testDb()('audit_log').where({ entity: 'addresses' }).first()).toBeUndefined();
  });

  it('rolls back rows already written when the database refuses one', async () => {
    const admin = asSessionUser(await makeUser('admin'));
    // 1200 rows staged and moved in one INSERT … SELECT; a row near the end fails a constraint.
    const rows = Array.from({ length: 1200 }, (_, i) => `Plot ${i},KV${i},-47.2,-128.5`);
    await testDb().raw("ALTER TABLE addresses ADD CONSTRAINT test_no_plot_1100 CHECK (label <> 'Plot 1100')");
    try {
      const res = await call(importAddresses, { user: admin, ...multipart(`label,postcode,lat,lon\n${rows.join('\n')}`) });
      expect(res.status).toBe(400);
      expect(await count()).toBe(0);
    } finally {
      await testDb().raw('ALTER TABLE addresses DROP CONSTRAINT test_no_plot_1100');
    }
  });

  it('reports a file without the needed columns (422) and an empty upload (400)', async () => {
    const admin = asSessionUser(await makeUser('admin'));
    const cols = await call(importAddresses, { user: admin, ...multipart('name,lat,lon\nA,1,2') });
    expect(cols.status).toBe(422);
    expect(cols.body.error.fields.file[0]).toMatch(/Missing column: label/);
    const empty = await call(importAddresses, { user: admin, ...multipart('') });
    expect(empty.status).toBe(400);
    const none = new FormData();
    none.append('other', 'x');
    const noFile = await call(importAddresses, { user: admin, body: none });
    expect(noFile.status).toBe(400);
    expect(noFile.body.error.fields.file).toEqual(['Choose a CSV file']);
  });

  it('refuses other file types (415) and files over the configured limit (413)', async () => {
    const admin = asSessionUser(await makeUser('admin'));
    expect((await call(importAddresses, { user: admin, ...multipart('x', 'photo.png', 'image/png') })).status).toBe(415);
    expect(
      (await call(importAddresses, { user: admin, ...multipart('x', 'book.xlsx', 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet') }))
        .status,
    ).toBe(415);
    expect((await call(importAddresses, { user: admin, json: { label: 'x' } })).status).toBe(415);
    expect(
      (await call(importAddresses, { user: admin, ...multipart(new Uint8Array([0x50, 0x4b, 0, 0]) as Uint8Array<ArrayBuffer>, 'sheet.csv') })).status,
    ).toBe(415);
    const big = 'label,postcode,lat,lon\n' + 'Long Lane Farm,KV1 1AA,-47.2,-128.5\n'.repeat(Math.ceil(LIMIT / 36) + 10);
    const multi = await call(importAddresses, { user: admin, ...multipart(big) });
    expect(multi.status).toBe(413);
    expect(multi.body.error.code).toBe('PAYLOAD_TOO_LARGE');
    const raw = await call(importAddresses, { user: admin, body: big, headers: { 'content-type': 'text/csv' } });
    expect(raw.status).toBe(413);
    expect(await count()).toBe(0);
  });

  it('lists addresses with a search and paging', async () => {
    const admin = asSessionUser(await makeUser('admin'));
    await call(importAddresses, { user: admin, ...multipart(GOOD) });
    const all = await call(listAddresses, { user: admin, url: '/api/addresses?limit=2' });
    expect(all.body.total).toBe(3);
    expect(all.body.items).toHaveLength(2);
    expect(all.body.items[0]).toMatchObject({ label: '3 Quay Row', postcode: null, lat: -47.25, lon: -128.6, source: 'import' });
    const some = await call(listAddresses, { user: admin, url: '/api/addresses?q=kv3' });
    expect(some.body.total).toBe(2);
    const bad = await call(listAddresses, { user: admin, url: '/api/addresses?limit=0' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields.limit).toBeDefined();
  });

  it('pages by keyset: each next cursor continues in label order, the last page has none', async () => {
    const admin = asSessionUser(await makeUser('admin'));
    const rows = Array.from({ length: 7 }, (_, i) => `${String.fromCharCode(71 - i)} Keyset Lane,KS${i},-47.2,-128.5`);
    await call(importAddresses, { user: admin, ...multipart(`label,postcode,lat,lon\n${rows.join('\n')}`) });
    const seen: string[] = [];
    let url = '/api/addresses?q=keyset&limit=3';
    for (let page = 0; page < 5; page++) {
      const res = await call(listAddresses, { user: admin, url });
      expect(res.status).toBe(200);
      expect(res.body).toMatchObject({ total: 7, total_exact: true });
      seen.push(...res.body.items.map((a: { label: string }) => a.label));
      if (!res.body.next) break;
      url = `/api/addresses?q=keyset&limit=3&after=${res.body.next}`;
    }
    expect(seen).toEqual(['A Keyset Lane', 'B Keyset Lane', 'C Keyset Lane', 'D Keyset Lane', 'E Keyset Lane', 'F Keyset Lane', 'G Keyset Lane']);
    const bad = await call(listAddresses, { user: admin, url: '/api/addresses?after=bm90LWEtY3Vyc29y' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields.after).toBeDefined();
  });
});
