import { afterAll, beforeEach, describe, expect, it } from 'vitest';
import { POST as importReadings } from '../../src/pages/api/readings/import';
import { GET as sampleCsv } from '../../src/pages/api/readings/sample.csv';
import { GET as getJob } from '../../src/pages/api/jobs/[id]';
import { GET as listJobs } from '../../src/pages/api/jobs/index';
import { stopJobQueue } from '../../src/lib/server/jobs/runtime';
import { checkReadingCsvHeader } from '../../src/lib/domain/reading-csv';
import type { JobJson } from '../../src/lib/schemas/jobs';
import { call } from '../helpers/endpoint';
import { testDb, truncateAll } from '../helpers/db';
import { asSessionUser, makeUser } from '../helpers/factories';
import { buildReadingsFixture, csvUpload, readingCsv, type ReadingsFixture } from '../helpers/readings-fixture';

type User = ReturnType<typeof asSessionUser>;

async function countReadings(): Promise<number> {
  return Number((await testDb()('readings').count('* as n').first())!.n);
}

async function waitForJob(id: string, user: User): Promise<JobJson> {
  for (let i = 0; i < 240; i++) {
    const res = await call(getJob, { user, params: { id } });
    if (res.body.state === 'completed' || res.body.state === 'failed') return res.body;
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new Error(`job ${id} did not finish`);
}

describe('readings import API', () => {
  let f: ReadingsFixture;
  let surveyor: User;
  beforeEach(async () => {
    await truncateAll();
    f = await buildReadingsFixture();
    surveyor = asSessionUser(await makeUser('surveyor'));
  });
  afterAll(stopJobQueue);

  it('answers 401 signed out and 403 for roles that may not write readings', async () => {
    expect((await call(importReadings, csvUpload(readingCsv(2)))).status).toBe(401);
    for (const role of ['planner', 'reviewer', 'contributor'] as const) {
      const res = await call(importReadings, { user: asSessionUser(await makeUser(role)), ...csvUpload(readingCsv(2)) });
      expect(res.status).toBe(403);
      expect(res.body.error.code).toBe('FORBIDDEN');
    }
    expect(await countReadings()).toBe(0);
  });

  it('refuses what is not a CSV (415), an empty file (400) and a header without the needed columns (422)', async () => {
    expect((await call(importReadings, { user: surveyor, json: { rows: [] } })).status).toBe(415);
    const png = new FormData();
    png.append('file', new File([new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0, 0])], 'log.png', { type: 'image/png' }));
    expect((await call(importReadings, { user: surveyor, body: png })).status).toBe(415);
    const empty = await call(importReadings, { user: surveyor, ...csvUpload('') });
    expect(empty.status).toBe(400);
    expect(empty.body.error.fields.file).toEqual(['The file is empty']);
    const cols = await call(importReadings, { user: surveyor, ...csvUpload('time,lat,lon\n2026-11-30T09:00:00Z,1,2\n') });
    expect(cols.status).toBe(422);
    expect(cols.body.error.fields.file).toEqual(checkReadingCsvHeader(['time', 'lat', 'lon']));
  });

  it('stores nothing when line 5,001 of 10,000 is bad, and names that line (422)', async () => {
    const csv = readingCsv(10_000, { 5001: { rsrp_dbm: '-20' } });
    const res = await call(importReadings, { user: surveyor, ...csvUpload(csv) });
    expect(res.status).toBe(422);
    expect(res.body.error.message).toBe('1 row has problems; nothing was imported. Fix it and import the file again');
    // 3GPP TS 36.133 Table 9.1.4-1: reported LTE RSRP stops at -44 dBm.
    expect(res.body.error.fields).toEqual({ 'line 5001': ['LTE RSRP -20 dBm is outside -140 … -44 dBm'] });
    expect(await countReadings()).toBe(0);
    expect(Number((await testDb()('reading_import_rows').count('* as n').first())!.n)).toBe(0);
    expect(await testDb()('jobs').first()).toBeUndefined();
  });

  it('lists every bad row with its reasons: channel outside the band tables, PCI, time, tech', async () => {
    const csv = readingCsv(6, {
      3: { channel: '99999' },
      4: { pci: '504' },
      5: { time: '30/11/2026 09:00' },
      6: { tech: 'wifi' },
    });
    const res = await call(importReadings, { user: surveyor, ...csvUpload(csv) });
    expect(res.status).toBe(422);
    expect(Object.keys(res.body.error.fields)).toEqual(['line 3', 'line 4', 'line 5', 'line 6']);
    expect(res.body.error.fields['line 3'][0]).toMatch(/99999/);
    // 3GPP TS 36.211 §6.11: 504 LTE physical cell identities, 0 … 503.
    expect(res.body.error.fields['line 4']).toEqual(['pci must be a whole number 0 … 503 for lte']);
    expect(res.body.error.fields['line 5'][0]).toMatch(/ISO 8601/);
    expect(res.body.error.fields['line 6'][0]).toMatch(/tech must be one of/);
  });

  it('imports 10,000 rows as a job, matching cells by technology, channel and PCI near each reading', async () => {
    const csv = readingCsv(10_000, {
      2: { mcc: '001', mnc: '02' }, // operator B: the Ridge cell, 11 km away, not Hill's
      3: { pci: '102' }, // no cell with this PCI
      4: { lon: '-127.5' }, // 75 km from any mast: beyond the matching radius
    });
    const res = await call(importReadings, { user: surveyor, ...csvUpload(csv, 'day-1.csv') });
    expect(res.status).toBe(202);
    expect(res.body).toMatchObject({ rows: 10_000, job_id: expect.any(String) });
    expect(res.headers.get('location')).toBe(`/api/jobs/${res.body.job_id}`);

    const job = await waitForJob(res.body.job_id, surveyor);
    expect(job).toMatchObject({ state: 'completed', progress: 100, counts: { rows: 10_000, imported: 10_000, matched: 9_998 }, error_count: 0 });
    expect(await countReadings()).toBe(10_000);
    const byLine = async (rsrp: number, time: string) => (await testDb()('readings').where({ taken_at: time }).first())!;
    const t = (i: number) => new Date(Date.UTC(2026, 10, 30, 9, 0, 0) + i * 1000);
    expect(String((await byLine(-70, t(0).toISOString())).cell_id)).toBe(f.ridgeCell);
    expect((await byLine(-71, t(1).toISOString())).cell_id).toBeNull();
    expect((await byLine(-72, t(2).toISOString())).cell_id).toBeNull();
    expect(String((await byLine(-73, t(3).toISOString())).cell_id)).toBe(f.hillCell);
    expect(Number((await testDb()('reading_import_rows').count('* as n').first())!.n)).toBe(0);
  });

  it('shows a job to its owner and admins only (others get 404), and checks the id', async () => {
    const res = await call(importReadings, { user: surveyor, ...csvUpload(readingCsv(3)) });
    const id = res.body.job_id;
    await waitForJob(id, surveyor);
    expect((await call(getJob, { params: { id } })).status).toBe(401);
    expect((await call(getJob, { user: asSessionUser(await makeUser('surveyor')), params: { id } })).status).toBe(404);
    expect((await call(getJob, { user: asSessionUser(await makeUser('admin')), params: { id } })).status).toBe(200);
    const bad = await call(getJob, { user: surveyor, params: { id: '12' } });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields.id).toBeDefined();
    const mine = await call(listJobs, { user: surveyor, url: '/api/jobs' });
    expect(mine.body.total).toBe(1);
    expect((await call(listJobs, { user: asSessionUser(await makeUser('planner')), url: '/api/jobs' })).body.total).toBe(0);
    expect((await call(listJobs, { user: surveyor, url: '/api/jobs?limit=0' })).status).toBe(400);
  });

  it('offers a sample CSV made around the cells on the map, that imports as it is with every row matched', async () => {
    const sample = await call(sampleCsv, { user: surveyor });
    expect(sample.status).toBe(200);
    expect(sample.headers.get('content-type')).toContain('text/csv');
    // Two readings for each of the fixture's two cells (one per operator): Hill's and Ridge's.
    const lines = sample.text.trim().split('\n');
    expect(lines).toHaveLength(5);
    const res = await call(importReadings, { user: surveyor, ...csvUpload(sample.body) });
    expect(res.status).toBe(202);
    expect(await waitForJob(res.body.job_id, surveyor)).toMatchObject({ state: 'completed', counts: { rows: 4, imported: 4, matched: 4 } });
    expect(await countReadings()).toBe(4);
    const byCell = await testDb()('readings').select('cell_id').count('* as n').groupBy('cell_id').orderBy('cell_id');
    expect(byCell).toEqual([
      { cell_id: f.hillCell, n: '2' },
      { cell_id: f.ridgeCell, n: '2' },
    ]);
  });
});
