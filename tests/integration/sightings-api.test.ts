import { beforeEach, describe, expect, it } from 'vitest';
import exifr from 'exifr';
import { GET as listRoute, POST as submitRoute } from '../../src/pages/api/sightings/index';
import { GET as getRoute } from '../../src/pages/api/sightings/[id]';
import { GET as photoRoute } from '../../src/pages/api/sightings/photos/[id]/[variant]';
import { GET as pendingRoute } from '../../src/pages/api/sightings/pending';
import { GET as surveysRoute } from '../../src/pages/api/masts/[id]/surveys';
import { createOperator } from '../../src/lib/server/repos/operators';
import { createMast } from '../../src/lib/server/repos/masts';
import { MastInputSchema } from '../../src/lib/schemas/masts';
import { MAX_PHOTO_BYTES } from '../../src/lib/schemas/sightings';
import { ROLES, type Role } from '../../src/lib/domain/roles';
import type { SessionUser } from '../../src/lib/server/session-user';
import { call } from '../helpers/endpoint';
import { testDb, truncateAll } from '../helpers/db';
import { asSessionUser, makeUser } from '../helpers/factories';
import { makeJpeg } from '../helpers/photos';

const HILL = { lat: -47.2, lon: -128.5 };
let uuidCounter = 0;
const nextUuid = () => `00000000-0000-4000-8000-${String(++uuidCounter).padStart(12, '0')}`;

function sightingBody(overrides: Record<string, unknown> = {}) {
  return {
    client_uuid: nextUuid(),
    ...HILL,
    position_source: 'map',
    structure_type: 'lattice_tower',
    estimated_height_m: 35,
    observed_at: '2026-11-30T10:00:00Z',
    ...overrides,
  };
}

function form(sighting: unknown, photos: Array<{ bytes: Buffer; name: string; type?: string }> = []): FormData {
  const fd = new FormData();
  fd.append('sighting', typeof sighting === 'string' ? sighting : JSON.stringify(sighting));
  for (const p of photos) fd.append('photo', new Blob([new Uint8Array(p.bytes)], { type: p.type ?? 'image/jpeg' }), p.name);
  return fd;
}

const submit = (user: SessionUser | null, body: FormData) => call(submitRoute, { method: 'POST', url: '/api/sightings', user, body });

describe('sightings API', () => {
  const users = {} as Record<Role, SessionUser>;
  let otherSurveyor: SessionUser;
  let operatorId: string;
  beforeEach(async () => {
    await truncateAll();
    for (const role of ROLES) users[role] = asSessionUser(await makeUser(role));
    otherSurveyor = asSessionUser(await makeUser('surveyor'));
    operatorId = (await createOperator(testDb(), { name: 'Test Mobile A', mcc: '001', mnc: '01' }, null)).id;
  });

  it("takes a sighting with cells and a photo: 201 pending, then listed as the author's own", async () => {
    const jpeg = await makeJpeg({ gps: HILL, takenAt: '2026:11:30 09:58:00' });
    const body = sightingBody({
      position_source: 'photo',
      operator_ids: [operatorId],
      // 3GPP TS 36.101 Table 5.7.3-1: EARFCN 1300 is in B3.
      cells: [{ operator_id: operatorId, tech: 'lte', channel: 1300, pci: 12, rsrp_dbm: -101, rsrq_db: -11, sinr_db: 4 }],
      notes: 'Fenced compound by the reservoir',
    });
    const res = await submit(users.surveyor, form(body, [{ bytes: jpeg, name: 'IMG_0001.jpg' }]));
    expect(res.status).toBe(201);
    expect(res.body).toEqual({ id: expect.any(String), status: 'pending' });
    expect(res.headers.get('location')).toBe(`/api/sightings/${res.body.id}`);

    const mine = await call(listRoute, { url: '/api/sightings?mine=1', user: users.surveyor });
    expect(mine.status).toBe(200);
    expect(mine.body.total).toBe(1);
    const s = mine.body.items[0];
    expect(s).toMatchObject({ id: res.body.id, status: 'pending', position_source: 'photo', notes: 'Fenced compound by the reservoir' });
    expect(s.cells[0]).toMatchObject({ band: 'B3', channel: 1300, pci: 12, rsrp_dbm: -101 });
    expect(s.photos).toHaveLength(1);
    expect(s.photos[0].original_url).toBeNull();
    expect(s.photos[0].taken_at).not.toBeNull();
    expect((await call(listRoute, { url: '/api/sightings?mine=1', user: otherSurveyor })).body.total).toBe(0);
  });

  it('serves copies without GPS to the author and the original with GPS to reviewers only', async () => {
    const jpeg = await makeJpeg({ gps: HILL });
    const res = await submit(users.contributor, form(sightingBody({ position_source: 'photo' }), [{ bytes: jpeg, name: 'a.jpg' }]));
    expect(res.status).toBe(201);
    const detail = await call(getRoute, { params: { id: res.body.id }, user: users.reviewer });
    const photoId = detail.body.photos[0].id;
    expect(detail.body.photos[0].original_url).toBe(`/api/sightings/photos/${photoId}/original`);
    for (const variant of ['display', 'thumb']) {
      const r = await call(photoRoute, { params: { id: photoId, variant }, user: users.contributor });
      expect(r.status).toBe(200);
      expect(r.headers.get('content-type')).toBe('image/jpeg');
      const served = Buffer.from(r.body as string, 'binary');
      expect(served.length).toBeGreaterThan(0);
    }
    // Fetch the bytes undecoded to check them.
    const display = await photoRoute({ params: { id: photoId, variant: 'display' }, locals: { user: users.contributor, session: null } } as never);
    const displayBytes = Buffer.from(await display.arrayBuffer());
    expect(await exifr.gps(displayBytes).catch(() => undefined)).toBeUndefined();
    const original = await photoRoute({ params: { id: photoId, variant: 'original' }, locals: { user: users.reviewer, session: null } } as never);
    expect(original.status).toBe(200);
    const gps = await exifr.gps(Buffer.from(await original.arrayBuffer()));
    expect(gps.latitude).toBeCloseTo(HILL.lat, 5);
    expect((await call(photoRoute, { params: { id: photoId, variant: 'original' }, user: users.contributor })).status).toBe(403);
    expect((await call(photoRoute, { params: { id: photoId, variant: 'display' }, user: users.planner })).status).toBe(404);
    expect((await call(photoRoute, { params: { id: photoId, variant: 'sideways' }, user: users.reviewer })).status).toBe(400);
  });

  it('answers a retry with the same client UUID with 200 and the first sighting, never a second one', async () => {
    const body = sightingBody();
    const jpeg = await makeJpeg();
    const first = await submit(users.surveyor, form(body, [{ bytes: jpeg, name: 'a.jpg' }]));
    expect(first.status).toBe(201);
    const retries = await Promise.all([1, 2, 3].map(() => submit(users.surveyor, form(body, [{ bytes: jpeg, name: 'a.jpg' }]))));
    for (const r of retries) {
      expect(r.status).toBe(200);
      expect(r.body).toEqual({ id: first.body.id, status: 'pending' });
    }
    expect(await testDb()('sightings').count('* as n')).toEqual([{ n: '1' }]);
    expect(await testDb()('sighting_photos').count('* as n')).toEqual([{ n: '1' }]);
    const taken = await submit(otherSurveyor, form(body));
    expect(taken.status).toBe(409);
  });

  it('makes one sighting when the same UUID arrives twice at once', async () => {
    const body = sightingBody();
    const [a, b] = await Promise.all([submit(users.surveyor, form(body)), submit(users.surveyor, form(body))]);
    expect([a.status, b.status].sort()).toEqual([200, 201]);
    expect(a.body.id).toBe(b.body.id);
    expect(await testDb()('sightings').count('* as n')).toEqual([{ n: '1' }]);
  });

  it('refuses a page named .jpg with 415, and damaged images with 422', async () => {
    const html = Buffer.from('<!doctype html><html><script>alert(1)</script></html>');
    const res = await submit(users.surveyor, form(sightingBody(), [{ bytes: html, name: 'mast.jpg', type: 'image/jpeg' }]));
    expect(res.status).toBe(415);
    expect(res.body.error.code).toBe('UNSUPPORTED_MEDIA_TYPE');
    const broken = await submit(users.surveyor, form(sightingBody(), [{ bytes: Buffer.from([0xff, 0xd8, 0xff, 0xdb, 1, 2, 3]), name: 'b.jpg' }]));
    expect(broken.status).toBe(422);
    expect(await testDb()('sightings').count('* as n')).toEqual([{ n: '0' }]);
  });

  it('refuses a photo over the size limit (413) and a seventh photo', async () => {
    const big = Buffer.alloc(MAX_PHOTO_BYTES + 1, 7);
    big.set([0xff, 0xd8, 0xff, 0xe0]);
    const res = await submit(users.surveyor, form(sightingBody(), [{ bytes: big, name: 'huge.jpg' }]));
    expect(res.status).toBe(413);
    expect(res.body.error.message).toMatch(/at most 15 MB/);
    const small = await makeJpeg({ width: 32, height: 32 });
    const seven = Array.from({ length: 7 }, (_, i) => ({ bytes: small, name: `p${i}.jpg` }));
    const many = await submit(users.surveyor, form(sightingBody(), seven));
    expect(many.status).toBe(413);
    expect(many.body.error.message).toMatch(/At most 6 files/);
    expect(await testDb()('sightings').count('* as n')).toEqual([{ n: '0' }]);
  });

  it.each([
    [
      'a form without the sighting part',
      () => {
        const fd = new FormData();
        fd.append('other', 'x');
        return fd;
      },
      'sighting',
    ],
    ['a sighting part that is not JSON', () => form('{not json'), 'sighting'],
    ['a PCI out of range', () => form(sightingBody({ cells: [{ operator_id: 1, tech: 'lte', channel: 6300, pci: 600 }] })), 'cells.0.pci'],
    [
      'RSRP out of the reporting range',
      () => form(sightingBody({ cells: [{ operator_id: 1, tech: 'lte', channel: 6300, rsrp_dbm: -20 }] })),
      'cells.0.rsrp_dbm',
    ],
    ['a position from a photo without photos', () => form(sightingBody({ position_source: 'photo' })), 'position_source'],
    ['no structure type', () => form(sightingBody({ structure_type: undefined })), 'structure_type'],
  ])('answers 400 with fields for %s', async (_name, make, field) => {
    const res = await submit(users.surveyor, make());
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toHaveProperty([field]);
  });

  it('answers 400 when the position is far from where the photo was taken', async () => {
    const jpeg = await makeJpeg({ gps: { lat: HILL.lat + 0.01, lon: HILL.lon } }); // ~1.1 km north
    const res = await submit(users.surveyor, form(sightingBody({ position_source: 'photo' }), [{ bytes: jpeg, name: 'a.jpg' }]));
    expect(res.status).toBe(400);
    expect(res.body.error.fields.lat[0]).toMatch(/1\d{3} m from the photo/);
  });

  it('answers 415 for a JSON body', async () => {
    const res = await call(submitRoute, { method: 'POST', user: users.surveyor, json: sightingBody() });
    expect(res.status).toBe(415);
  });

  describe('role matrix', () => {
    const submitters: Role[] = ['admin', 'surveyor', 'contributor'];
    const reviewers: Role[] = ['admin', 'reviewer'];

    it.each(ROLES)('POST /api/sightings and GET ?mine=1 as %s', async (role) => {
      const res = await submit(users[role], form(sightingBody()));
      expect(res.status).toBe(submitters.includes(role) ? 201 : 403);
      const mine = await call(listRoute, { url: '/api/sightings?mine=1', user: users[role] });
      expect(mine.status).toBe(submitters.includes(role) ? 200 : 403);
      if (mine.status === 403) expect(mine.body.error.code).toBe('FORBIDDEN');
    });

    it.each(ROLES)('GET /api/sightings (every sighting) as %s', async (role) => {
      const res = await call(listRoute, { url: '/api/sightings?status=pending', user: users[role] });
      expect(res.status).toBe(reviewers.includes(role) ? 200 : 403);
    });

    it.each(ROLES)("GET /api/sightings/:id of someone else's sighting as %s", async (role) => {
      const created = await submit(otherSurveyor, form(sightingBody()));
      const res = await call(getRoute, { params: { id: created.body.id }, user: users[role] });
      expect(res.status).toBe(reviewers.includes(role) ? 200 : submitters.includes(role) ? 404 : 403);
    });

    it.each(ROLES)("GET /api/sightings/pending as %s shows others' sightings only to reviewers", async (role) => {
      await submit(otherSurveyor, form(sightingBody()));
      if (submitters.includes(role)) await submit(users[role], form(sightingBody({ lat: -47.3 })));
      const res = await call(pendingRoute, { url: '/api/sightings/pending?bbox=-129,-48,-128,-47', user: users[role] });
      expect(res.status).toBe(200);
      const count = (reviewers.includes(role) ? 1 : 0) + (submitters.includes(role) ? 1 : 0);
      expect(res.body.features).toHaveLength(count);
      const own = res.body.features.filter((f: { properties: { mine: boolean } }) => f.properties.mine);
      expect(own).toHaveLength(submitters.includes(role) ? 1 : 0);
    });

    it.each(ROLES)('GET /api/masts/:id/surveys as %s', async (role) => {
      const mast = await createMast(testDb(), MastInputSchema.parse({ name: 'Test Hill', ...HILL }), null);
      const res = await call(surveysRoute, { params: { id: mast.id }, user: users[role] });
      expect(res.status).toBe(200);
      expect(res.body).toEqual({ surveyors: [], last_observed_at: null, photos: [] });
    });

    it('answers 401 to a signed-out caller on every route', async () => {
      expect((await submit(null, form(sightingBody()))).status).toBe(401);
      expect((await call(listRoute, { url: '/api/sightings?mine=1' })).status).toBe(401);
      expect((await call(getRoute, { params: { id: '1' } })).status).toBe(401);
      expect((await call(photoRoute, { params: { id: '1', variant: 'thumb' } })).status).toBe(401);
      expect((await call(pendingRoute, { url: '/api/sightings/pending' })).status).toBe(401);
      expect((await call(surveysRoute, { params: { id: '1' } })).status).toBe(401);
    });

    it('answers 404 for unknown sightings, photos and masts, and 400 for bad ids', async () => {
      expect((await call(getRoute, { params: { id: '424242' }, user: users.reviewer })).status).toBe(404);
      expect((await call(photoRoute, { params: { id: '424242', variant: 'thumb' }, user: users.reviewer })).status).toBe(404);
      expect((await call(surveysRoute, { params: { id: '424242' }, user: users.planner })).status).toBe(404);
      expect((await call(getRoute, { params: { id: 'abc' }, user: users.reviewer })).status).toBe(400);
      expect((await call(pendingRoute, { url: '/api/sightings/pending?bbox=1,2,3', user: users.reviewer })).body.error.fields).toHaveProperty('bbox');
    });
  });

  it('shows the photos, surveyors and last observation of a mast once its sighting is approved', async () => {
    const mast = await createMast(testDb(), MastInputSchema.parse({ name: 'Test Hill', ...HILL }), null);
    const res = await submit(users.surveyor, form(sightingBody({ observed_at: '2026-11-20T08:00:00Z' }), [{ bytes: await makeJpeg(), name: 'a.jpg' }]));
    // The review side's decision, written directly here.
    await testDb()('sightings')
      .where({ id: res.body.id })
      .update({ status: 'approved', mast_id: mast.id, decided_by: users.reviewer.id, decided_at: new Date() });
    const surveys = await call(surveysRoute, { params: { id: mast.id }, user: users.planner });
    expect(surveys.body.surveyors).toEqual([{ id: users.surveyor.id, name: users.surveyor.name, last_observed_at: '2026-11-20T08:00:00.000Z' }]);
    expect(surveys.body.last_observed_at).toBe('2026-11-20T08:00:00.000Z');
    expect(surveys.body.photos).toHaveLength(1);
    expect(surveys.body.photos[0].original_url).toBeNull();
    const thumb = await call(photoRoute, { params: { id: surveys.body.photos[0].id, variant: 'thumb' }, user: users.planner });
    expect(thumb.status).toBe(200);
  });
});
