// The review queue and decisions against the real database: duplicates within 300 m (PostGIS
// geography), approve / merge / reject, one decision per sighting even when two reviewers press
// at once, the audit trail, the submitter's mail and the hourly reviewer alert.
import { randomUUID } from 'node:crypto';
import { beforeEach, describe, expect, it } from 'vitest';
import { POST as decide } from '../../src/pages/api/sightings/[id]/decision';
import { GET as queue } from '../../src/pages/api/review/sightings';
import { createOperator } from '../../src/lib/server/repos/operators';
import { createMast } from '../../src/lib/server/repos/masts';
import { createCell } from '../../src/lib/server/repos/cells';
import { createSighting, type NewSightingPhoto } from '../../src/lib/server/repos/sightings';
import { alertReviewers } from '../../src/lib/server/review-mail';
import { CellInputSchema, MastInputSchema } from '../../src/lib/schemas/masts';
import { SightingInputSchema } from '../../src/lib/schemas/sightings';
import { ROLES, can } from '../../src/lib/domain/roles';
import { call } from '../helpers/endpoint';
import { testDb, truncateAll } from '../helpers/db';
import { asSessionUser, makeUser } from '../helpers/factories';
import { mailTo } from '../helpers/mail';

// A fictional spot in open sea; 0.001° of latitude is 111 m (WGS84, from memory: 111.1–111.7 km per degree).
const LAT = -47.2;
const LON = -128.5;
const north = (m: number) => LAT + m / 111_200;

const run = Date.now().toString(36);
let seq = 0;

let op1: string;
let op2: string;

interface CellSeen {
  op: string;
  channel: number;
  pci: number | null;
  observed?: string;
}
/** An LTE cell by operator, EARFCN and PCI (and when it was last observed). */
const lte = (op: string, channel: number, pci: number | null, observed?: string): CellSeen => ({ op, channel, pci, observed });

async function mast(name: string, lat: number, cells: CellSeen[]) {
  const m = await createMast(testDb(), MastInputSchema.parse({ name, lat, lon: LON, structure_type: 'monopole' }), null);
  for (const c of cells) {
    await createCell(
      testDb(),
      m.id,
      CellInputSchema.parse({ operator_id: c.op, tech: 'lte', channel: c.channel, pci: c.pci, last_observed_at: c.observed ?? null }),
      null,
    );
  }
  return m;
}

const photo = (n: number): NewSightingPhoto => ({
  sha256: String(n).repeat(64).slice(0, 64),
  mime: 'image/jpeg',
  byteSize: 2048,
  width: 800,
  height: 600,
  originalName: `mast-${n}.jpg`,
  originalKey: `photos/original/${n}`,
  displayKey: `photos/display/${n}`,
  thumbKey: `photos/thumb/${n}`,
  gpsLat: LAT,
  gpsLon: LON,
  takenAt: new Date('2026-11-30T09:59:00Z'),
});

async function sighting(authorId: string, cells: CellSeen[], opts: { lat?: number; photos?: number; observed?: string } = {}) {
  const input = SightingInputSchema.parse({
    client_uuid: randomUUID(),
    lat: opts.lat ?? LAT,
    lon: LON,
    position_source: 'map',
    structure_type: 'lattice_tower',
    estimated_height_m: 25,
    observed_at: opts.observed ?? '2026-11-30T10:00:00Z',
    cells: cells.map((c) => ({ operator_id: c.op, tech: 'lte', channel: c.channel, pci: c.pci, rsrp_dbm: -95 })),
  });
  const photos = Array.from({ length: opts.photos ?? 0 }, (_, i) => photo(i + 1));
  return (await testDb().transaction((trx) => createSighting(trx, input, authorId, photos))).sighting;
}

async function people() {
  const surveyor = await makeUser('surveyor', { email: `surveyor.${run}.${++seq}@example.test`, name: 'Bryn Talow' });
  const reviewer = asSessionUser(await makeUser('reviewer', { name: 'Ines Review' }));
  return { surveyor, reviewer };
}

beforeEach(async () => {
  await truncateAll();
  op1 = (await createOperator(testDb(), { name: 'Test Mobile A', mcc: '001', mnc: '01' }, null)).id;
  op2 = (await createOperator(testDb(), { name: 'Test Mobile B', mcc: '001', mnc: '02' }, null)).id;
});

describe('review queue', () => {
  it('lists pending sightings oldest first with ranked duplicates within 300 m and the submitter record', async () => {
    const { surveyor, reviewer } = await people();
    const near = await mast('Near, nothing shared', north(40), [lte(op1, 6300, 1)]);
    const shared = await mast('Shares two cells', north(250), [lte(op1, 6300, 101), lte(op2, 1300, 7)]);
    await mast('Too far', north(330), [lte(op1, 6300, 101)]);
    const first = await sighting(surveyor.id, [lte(op1, 6300, 101), lte(op2, 1300, 7)], { photos: 2 });
    const second = await sighting(surveyor.id, [], { lat: north(5000) });
    const done = await sighting(surveyor.id, [], { lat: north(9000) });
    await testDb()('sightings')
      .where({ id: done.id })
      .update({ status: 'rejected', decided_at: new Date(), decided_by: reviewer.id, decision_reason: 'Blurred photo' });

    const res = await call(queue, { user: reviewer, url: '/api/review/sightings' });
    expect(res.status).toBe(200);
    expect(res.body.total).toBe(2);
    expect(res.body.radius_m).toBe(300);
    expect(res.body.items.map((i: { sighting: { id: string } }) => i.sighting.id)).toEqual([first.id, second.id]);
    const item = res.body.items[0];
    expect(item.submitter).toEqual({ approved: 0, merged: 0, rejected: 1, pending: 2 });
    expect(item.candidates.map((c: { mast: { id: string }; shared_cells: number }) => [c.mast.id, c.shared_cells])).toEqual([
      [shared.id, 2],
      [near.id, 0],
    ]);
    // Geodesic distance on the ellipsoid: 250 m north within a metre.
    expect(item.candidates[0].distance_m).toBeCloseTo(250, -1);
    expect(item.candidates[0].cells).toHaveLength(2);
    expect(item.sighting.photos).toHaveLength(2);
    expect(item.sighting.photos[0].original_url).toMatch(/original$/);
    expect(res.body.items[1].candidates).toEqual([]);
  });

  it.each(ROLES)('is open to reviewers and admins only (%s)', async (role) => {
    const u = asSessionUser(await makeUser(role));
    const res = await call(queue, { user: u, url: '/api/review/sightings' });
    expect(res.status).toBe(can(role, 'sightings:review') ? 200 : 403);
    expect(['reviewer', 'admin'].includes(role)).toBe(res.status === 200);
  });

  it('answers 401 signed out and 400 for a bad page', async () => {
    expect((await call(queue, { url: '/api/review/sightings' })).status).toBe(401);
    const { reviewer } = await people();
    const bad = await call(queue, { user: reviewer, url: '/api/review/sightings?limit=0' });
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.error.fields)).toEqual(['limit']);
  });
});

describe('deciding a sighting', () => {
  it('approves: a new active mast with the sighting cells, audited, and the submitter is mailed', async () => {
    const { surveyor, reviewer } = await people();
    const s = await sighting(surveyor.id, [lte(op1, 6300, 101), lte(op1, 6300, 101), lte(op2, 1300, 7)], { photos: 1 });
    const res = await call(decide, { user: reviewer, params: { id: s.id }, json: { decision: 'approve', name: 'Kestrel Hill lattice' } });
    expect(res.status).toBe(200);
    expect(res.body.sighting).toMatchObject({ status: 'approved', decided_by: { id: reviewer.id }, mast_id: res.body.mast.id });
    expect(res.body.mast).toMatchObject({
      name: 'Kestrel Hill lattice',
      status: 'active',
      structure_type: 'lattice_tower',
      structure_height_m: 25,
      source: 'sighting',
    });
    expect(res.body.mast.lat).toBeCloseTo(LAT, 9);
    expect(res.body.added_cells).toBe(2);
    const cells = await testDb()('cells').where({ mast_id: res.body.mast.id }).orderBy('channel');
    expect(cells.map((c) => [String(c.operator_id), c.channel, c.pci, c.band])).toEqual([
      [op2, 1300, 7, 'B3'],
      [op1, 6300, 101, 'B20'],
    ]);
    expect(cells[0].last_observed_at.toISOString()).toBe('2026-11-30T10:00:00.000Z');
    const audit = await testDb()('audit_log').where({ entity: 'sighting', entity_id: s.id, action: 'approve' }).first();
    expect(audit).toMatchObject({ user_id: reviewer.id });
    expect(audit.before.status).toBe('pending');
    expect(audit.after).toMatchObject({ status: 'approved', mast_id: res.body.mast.id });
    expect(await testDb()('audit_log').where({ entity: 'mast', action: 'create', entity_id: res.body.mast.id }).first()).toBeDefined();

    const [mail] = await mailTo(surveyor.email);
    expect(mail!.subject).toBe('Your sighting is on the map');
    expect(mail!.text).toContain('"Kestrel Hill lattice", with 2 cells');
    expect(mail!.html).toContain('Kestrel Hill lattice');
  });

  it('merges: adds only new cells, marks the known ones observed, attaches the photos', async () => {
    const { surveyor, reviewer } = await people();
    const target = await mast('Harrow Point', north(60), [lte(op1, 6300, 101, '2025-05-01T00:00:00Z'), lte(op2, 1300, 7, '2027-01-01T00:00:00Z')]);
    const s = await sighting(surveyor.id, [lte(op1, 6300, 101), lte(op2, 1300, 7), lte(op2, 3350, 12)], { photos: 2 });
    const res = await call(decide, {
      user: reviewer,
      params: { id: s.id },
      json: { decision: 'merge', mast_id: target.id, reason: 'Same lattice, new NR-less B7 cell' },
    });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ added_cells: 1, observed_cells: 2, mast: { id: target.id, row_version: 2 } });
    expect(res.body.sighting).toMatchObject({ status: 'merged', mast_id: target.id, decision_reason: 'Same lattice, new NR-less B7 cell' });
    const cells = await testDb()('cells').where({ mast_id: target.id }).orderBy('channel');
    expect(cells.map((c) => [c.channel, c.pci, c.last_observed_at.toISOString()])).toEqual([
      [1300, 7, '2027-01-01T00:00:00.000Z'], // already seen later: kept
      [3350, 12, '2026-11-30T10:00:00.000Z'],
      [6300, 101, '2026-11-30T10:00:00.000Z'],
    ]);
    const photos = await testDb()('sighting_photos as p').join('sightings as s', 's.id', 'p.sighting_id').where('s.mast_id', target.id).count('* as n').first();
    expect(photos).toEqual({ n: '2' });
    expect(await testDb()('audit_log').where({ entity: 'mast', entity_id: target.id, action: 'merge_sighting' }).first()).toBeDefined();
    const [mail] = await mailTo(surveyor.email);
    expect(mail!.subject).toBe('Your sighting confirmed a mast on the map');
    expect(mail!.text).toContain('added 1 new cell and confirmed 2 cells');
    expect(mail!.text).toContain("The reviewer's note: Same lattice");
  });

  it('rejects with a reason, makes no mast, and mails the reason', async () => {
    const { surveyor, reviewer } = await people();
    const s = await sighting(surveyor.id, [lte(op1, 6300, 101)]);
    const masts = await testDb()('masts').count('* as n').first();
    const noReason = await call(decide, { user: reviewer, params: { id: s.id }, json: { decision: 'reject' } });
    expect(noReason.status).toBe(400);
    expect(Object.keys(noReason.body.error.fields)).toEqual(['reason']);
    const res = await call(decide, { user: reviewer, params: { id: s.id }, json: { decision: 'reject', reason: 'This is a street light, not a mast' } });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ mast: null, added_cells: 0, sighting: { status: 'rejected', decision_reason: 'This is a street light, not a mast' } });
    expect(await testDb()('masts').count('* as n').first()).toEqual(masts);
    const [mail] = await mailTo(surveyor.email);
    expect(mail!.subject).toBe('Your sighting was not added to the map');
    expect(mail!.text).toContain("The reviewer's note: This is a street light, not a mast");
  });

  it('lets only one of two reviewers deciding at the same moment win; the other gets 409 and nothing changes twice', async () => {
    const { surveyor, reviewer } = await people();
    const other = asSessionUser(await makeUser('admin'));
    const s = await sighting(surveyor.id, [lte(op1, 6300, 101)]);
    const [a, b] = await Promise.all([
      call(decide, { user: reviewer, params: { id: s.id }, json: { decision: 'approve' } }),
      call(decide, { user: other, params: { id: s.id }, json: { decision: 'approve' } }),
    ]);
    expect([a.status, b.status].sort()).toEqual([200, 409]);
    const loser = a.status === 409 ? a : b;
    expect(loser.body.error.code).toBe('CONFLICT');
    expect(loser.body.error.message).toMatch(/already decided by/);
    expect(await testDb()('masts').count('* as n').first()).toEqual({ n: '1' });
    expect(await testDb()('cells').count('* as n').first()).toEqual({ n: '1' });
    expect(await testDb()('audit_log').where({ entity: 'sighting', entity_id: s.id, action: 'approve' }).count('* as n').first()).toEqual({ n: '1' });
    expect(await mailTo(surveyor.email)).toHaveLength(1);
  });

  it('answers a later decision on a decided sighting with 409, whatever the decision', async () => {
    const { surveyor, reviewer } = await people();
    const s = await sighting(surveyor.id, []);
    expect((await call(decide, { user: reviewer, params: { id: s.id }, json: { decision: 'reject', reason: 'Duplicate of my own report' } })).status).toBe(200);
    const again = await call(decide, { user: reviewer, params: { id: s.id }, json: { decision: 'approve' } });
    expect(again.status).toBe(409);
    expect(await testDb()('masts').count('* as n').first()).toEqual({ n: '0' });
  });

  it.each([
    [{ decision: 'merge' }, ['mast_id']],
    [{ decision: 'approve', mast_id: '1' }, ['mast_id']],
    [{ decision: 'reject', reason: 'no' }, ['reason']],
    [{ decision: 'reject', reason: 'Not a mast', name: 'X' }, ['name']],
    [{ decision: 'bless' }, ['decision']],
  ])('rejects bad input %j with 400 and fields', async (body, fields) => {
    const { surveyor, reviewer } = await people();
    const s = await sighting(surveyor.id, []);
    const res = await call(decide, { user: reviewer, params: { id: s.id }, json: body });
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields).sort()).toEqual(fields);
    expect((await testDb()('sightings').where({ id: s.id }).first()).status).toBe('pending');
  });

  it('refuses a merge into an unknown mast (400) and changes nothing; unknown sighting 404', async () => {
    const { surveyor, reviewer } = await people();
    const s = await sighting(surveyor.id, [lte(op1, 6300, 101)]);
    const res = await call(decide, { user: reviewer, params: { id: s.id }, json: { decision: 'merge', mast_id: '987654' } });
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toEqual({ mast_id: ['No such mast'] });
    expect((await testDb()('sightings').where({ id: s.id }).first()).status).toBe('pending');
    expect((await call(decide, { user: reviewer, params: { id: '987654' }, json: { decision: 'approve' } })).status).toBe(404);
    expect((await call(decide, { user: reviewer, params: { id: 'x1' }, json: { decision: 'approve' } })).status).toBe(400);
  });

  it.each(ROLES)('is for reviewers and admins only (%s)', async (role) => {
    const { surveyor } = await people();
    const s = await sighting(surveyor.id, []);
    const u = asSessionUser(await makeUser(role));
    const res = await call(decide, { user: u, params: { id: s.id }, json: { decision: 'reject', reason: 'Checking the guard' } });
    expect(res.status).toBe(can(role, 'sightings:review') ? 200 : 403);
    expect((await call(decide, { params: { id: s.id }, json: { decision: 'approve' } })).status).toBe(401);
  });
});

describe('reviewer alerts', () => {
  it('mails each active reviewer when sightings wait, at most once an hour, and again only for newer sightings', async () => {
    const surveyor = await makeUser('surveyor');
    const r1 = await makeUser('reviewer', { email: `r1.${run}.${++seq}@example.test` });
    const r2 = await makeUser('reviewer', { email: `r2.${run}.${++seq}@example.test` });
    const gone = await makeUser('reviewer', { email: `gone.${run}.${++seq}@example.test` });
    await testDb()('users').where({ id: gone.id }).update({ disabled_at: new Date() });
    const planner = await makeUser('planner', { email: `planner.${run}.${++seq}@example.test` });

    expect(await alertReviewers(testDb(), 'http://bearline.test')).toEqual([]); // nothing waits
    await sighting(surveyor.id, []);
    const t0 = new Date();
    expect((await alertReviewers(testDb(), 'http://bearline.test', t0)).sort()).toEqual([r1.email, r2.email].sort());
    const [mail] = await mailTo(r1.email);
    expect(mail!.subject).toBe('1 sighting waiting for review');
    expect(mail!.text).toContain('http://bearline.test/review');
    expect(await mailTo(gone.email)).toEqual([]);
    expect(await mailTo(planner.email)).toEqual([]);

    await sighting(surveyor.id, [], { lat: north(2000) });
    const later = (min: number) => new Date(t0.getTime() + min * 60_000);
    expect(await alertReviewers(testDb(), 'http://bearline.test', later(59))).toEqual([]);
    // Two app servers at once: one message each.
    const [x, y] = await Promise.all([
      alertReviewers(testDb(), 'http://bearline.test', later(61)),
      alertReviewers(testDb(), 'http://bearline.test', later(61)),
    ]);
    expect([...x, ...y].sort()).toEqual([r1.email, r2.email].sort());
    expect(await mailTo(r1.email)).toHaveLength(2);
    // An hour on, but nothing new since the last message: quiet.
    expect(await alertReviewers(testDb(), 'http://bearline.test', later(200))).toEqual([]);
  });
});
