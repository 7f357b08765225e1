import { beforeEach, describe, expect, it } from 'vitest';
import { createOperator } from '../../src/lib/server/repos/operators';
import {
  createSighting,
  findSighting,
  findSightingByClientUuid,
  listPendingSightings,
  listSightings,
  type NewSightingPhoto,
  type PendingViewer,
} from '../../src/lib/server/repos/sightings';
import { SightingInputSchema, pendingSightingsJson, sightingJson } from '../../src/lib/schemas/sightings';
import type { Bbox } from '../../src/lib/schemas/mast-query';

const listPendingSightingFeatures = async (db: Parameters<typeof listPendingSightings>[0], viewer: PendingViewer, bbox?: Bbox) =>
  pendingSightingsJson(await listPendingSightings(db, viewer, bbox), viewer.userId);
import { testDb, truncateAll } from '../helpers/db';
import { makeUser } from '../helpers/factories';

const UUID_A = '3f1c9a52-8d1e-4b7a-9c35-0a6e2d4b7f10';
const UUID_B = '7a2b4c6d-1e3f-4a5b-8c7d-9e0f1a2b3c4d';

function input(overrides: Record<string, unknown> = {}) {
  return SightingInputSchema.parse({
    client_uuid: UUID_A,
    lat: -47.2,
    lon: -128.5,
    position_source: 'map',
    structure_type: 'lattice_tower',
    estimated_height_m: 30,
    observed_at: '2026-11-30T10:00:00Z',
    ...overrides,
  });
}

const photo = (sha: string): NewSightingPhoto => ({
  sha256: sha.repeat(64).slice(0, 64),
  mime: 'image/jpeg',
  byteSize: 1234,
  width: 640,
  height: 480,
  originalName: 'mast.jpg',
  originalKey: `photos/original/${sha}`,
  displayKey: `photos/display/${sha}`,
  thumbKey: `photos/thumb/${sha}`,
  gpsLat: -47.2,
  gpsLon: -128.5,
  takenAt: new Date('2026-11-30T09:59:00Z'),
});

describe('sightings repo', () => {
  let op1: string;
  let op2: string;
  let surveyor: string;
  let other: string;
  beforeEach(async () => {
    await truncateAll();
    op1 = (await createOperator(testDb(), { name: 'Test Mobile A', mcc: '001', mnc: '01' }, null)).id;
    op2 = (await createOperator(testDb(), { name: 'Test Mobile B', mcc: '001', mnc: '02' }, null)).id;
    surveyor = (await makeUser('surveyor')).id;
    other = (await makeUser('contributor')).id;
  });

  it('creates a pending sighting with its operators, cells (band derived from the channel) and photos', async () => {
    const { sighting, created } = await testDb().transaction((trx) =>
      createSighting(
        trx,
        input({
          operator_ids: [op2],
          // 3GPP TS 36.101 Table 5.7.3-1: EARFCN 6300 is in B20 (806.0 MHz downlink).
          cells: [{ operator_id: op1, tech: 'lte', channel: 6300, pci: 101, sector_azimuth_deg: 120, rsrp_dbm: -95 }],
        }),
        surveyor,
        [photo('a'), photo('b'), photo('a')],
      ),
    );
    expect(created).toBe(true);
    expect(sighting.status).toBe('pending');
    expect(sighting.author.id).toBe(surveyor);
    expect(sighting.lat).toBeCloseTo(-47.2, 9);
    expect(sighting.lon).toBeCloseTo(-128.5, 9);
    expect(sighting.operators.map((o) => o.id).sort()).toEqual([op1, op2].sort());
    expect(sighting.cells).toHaveLength(1);
    expect(sighting.cells[0]).toMatchObject({ band: 'B20', channel: 6300, pci: 101, rsrpDbm: -95, dlMhz: 806 });
    expect(sighting.photos.map((p) => p.sha256[0])).toEqual(['a', 'b']);
    const json = sightingJson(sighting, { withOriginals: false });
    expect(json.photos[0]!.original_url).toBeNull();
    expect(json.photos[0]!.display_url).toMatch(/\/api\/sightings\/photos\/\d+\/display$/);
    const audit = await testDb()('audit_log').where({ entity: 'sighting', entity_id: sighting.id });
    expect(audit).toHaveLength(1);
  });

  it('returns the first sighting when the same author retries with the same client UUID', async () => {
    const first = await testDb().transaction((trx) => createSighting(trx, input(), surveyor, [photo('a')]));
    const again = await testDb().transaction((trx) => createSighting(trx, input({ notes: 'second try' }), surveyor, [photo('a')]));
    expect(again.created).toBe(false);
    expect(again.sighting.id).toBe(first.sighting.id);
    expect(again.sighting.notes).toBeNull();
    expect(await testDb()('sightings').count('* as n')).toEqual([{ n: '1' }]);
    expect(await testDb()('sighting_photos').count('* as n')).toEqual([{ n: '1' }]);
    expect((await findSightingByClientUuid(testDb(), UUID_A.toUpperCase()))?.id).toBe(first.sighting.id);
  });

  it('refuses a client UUID another author already used', async () => {
    await testDb().transaction((trx) => createSighting(trx, input(), surveyor, []));
    await expect(testDb().transaction((trx) => createSighting(trx, input(), other, []))).rejects.toMatchObject({ code: 'CONFLICT' });
  });

  it('lists by author newest first, and the pending map layer shows others only to reviewers', async () => {
    const a = await testDb().transaction((trx) => createSighting(trx, input({ observed_at: '2026-11-01T00:00:00Z' }), surveyor, []));
    const b = await testDb().transaction((trx) => createSighting(trx, input({ client_uuid: UUID_B, lat: -47.3 }), other, []));
    const mine = await listSightings(testDb(), { authorId: surveyor, limit: 50, offset: 0 });
    expect(mine.total).toBe(1);
    expect(mine.items.map((s) => s.id)).toEqual([a.sighting.id]);
    const queue = await listSightings(testDb(), { status: 'pending', oldestFirst: true, limit: 50, offset: 0 });
    expect(queue.items.map((s) => s.id)).toEqual([a.sighting.id, b.sighting.id]);

    const own = await listPendingSightingFeatures(testDb(), { userId: surveyor, seesAll: false });
    expect(own.features.map((f) => f.properties.id)).toEqual([a.sighting.id]);
    expect(own.features[0]!.properties.mine).toBe(true);
    const all = await listPendingSightingFeatures(testDb(), { userId: '999999', seesAll: true });
    expect(all.features.map((f) => f.properties.id).sort()).toEqual([a.sighting.id, b.sighting.id].sort());
    const boxed = await listPendingSightingFeatures(testDb(), { userId: '999999', seesAll: true }, { minLon: -129, minLat: -47.25, maxLon: -128, maxLat: -47 });
    expect(boxed.features.map((f) => f.properties.id)).toEqual([a.sighting.id]);
    expect(boxed.features[0]!.geometry.coordinates).toEqual([-128.5, -47.2]);
  });

  it('finds a sighting by id and answers 404 for an unknown one', async () => {
    const { sighting } = await testDb().transaction((trx) => createSighting(trx, input(), surveyor, []));
    expect((await findSighting(testDb(), sighting.id)).clientUuid).toBe(UUID_A);
    await expect(findSighting(testDb(), '987654')).rejects.toMatchObject({ code: 'NOT_FOUND' });
  });
});
