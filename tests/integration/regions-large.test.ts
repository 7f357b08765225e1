// A region with very many points: capped in size and vertices, stored once, and sent to the map and
// the regions page only as an outline simplified to a pixel (never the full geometry in a list).
import { beforeEach, describe, expect, it } from 'vitest';
import { GET as listRegions, POST as createRegion } from '../../src/pages/api/regions/index';
import { GET as getRegion } from '../../src/pages/api/regions/[id]';
import { MAX_REGION_VERTICES } from '../../src/lib/domain/region-outline';
import { call } from '../helpers/endpoint';
import { truncateAll } from '../helpers/db';
import { asSessionUser, makeUser } from '../helpers/factories';
import type { SessionUser } from '../../src/lib/server/session-user';

/** A closed ring of `n` vertices around a centre: a circle with a small deterministic wobble, the
 * way a surveyed boundary has detail far below what a map can show. */
function bumpyOutline(n: number, radiusDeg = 0.2) {
  const ring: number[][] = [];
  for (let i = 0; i < n - 1; i += 1) {
    const a = (2 * Math.PI * i) / (n - 1);
    const r = radiusDeg * (1 + 0.0002 * Math.sin(i * 7.3));
    ring.push([Number((-128.5 + r * Math.cos(a)).toFixed(7)), Number((-47.2 + r * Math.sin(a)).toFixed(7))]);
  }
  ring.push(ring[0]!);
  return { type: 'Polygon', coordinates: [ring] };
}

const vertexCount = (g: { coordinates: number[][][][] }) => g.coordinates.flat(2).length;

describe('regions with very many points', () => {
  let admin: SessionUser;
  beforeEach(async () => {
    await truncateAll();
    admin = asSessionUser(await makeUser('admin'));
  });

  it('stores a detailed outline in full and lists it simplified to a pixel', async () => {
    const n = 45_000;
    const created = await call(createRegion, { user: admin, json: { name: 'Detailed Fells', geometry: bumpyOutline(n) } });
    expect(created.status).toBe(201);
    expect(created.body.vertex_count).toBe(n);

    const list = await call(listRegions, { user: admin, url: '/api/regions' });
    expect(list.status).toBe(200);
    const [item] = list.body.items;
    expect(item.simplified_for_zoom).toBe(8);
    expect(item.vertex_count).toBe(n);
    expect(vertexCount(item.geometry)).toBeLessThan(600);
    expect(vertexCount(item.geometry)).toBeGreaterThanOrEqual(4);
    expect(JSON.stringify(list.body).length).toBeLessThan(30_000);
    // The bbox is of the full outline.
    expect(item.bbox[0]).toBeCloseTo(-128.7, 2);
    expect(item.bbox[3]).toBeCloseTo(-47.0, 2);

    // Finer zooms keep more detail; one region without a zoom comes in full.
    const fine = await call(listRegions, { user: admin, url: '/api/regions?zoom=14' });
    expect(vertexCount(fine.body.items[0].geometry)).toBeGreaterThan(vertexCount(item.geometry));
    const full = await call(getRegion, { user: admin, params: { id: item.id }, url: `/api/regions/${item.id}` });
    expect(full.body.simplified_for_zoom).toBeNull();
    expect(vertexCount(full.body.geometry)).toBe(n);
    const one = await call(getRegion, { user: admin, params: { id: item.id }, url: `/api/regions/${item.id}?zoom=8` });
    expect(vertexCount(one.body.geometry)).toBe(vertexCount(item.geometry));
  });

  it(`refuses more than ${MAX_REGION_VERTICES} vertices with a clear 400`, async () => {
    const res = await call(createRegion, { user: admin, json: { name: 'Too fine', geometry: bumpyOutline(MAX_REGION_VERTICES + 1, 0.1) } });
    expect(res.status).toBe(400);
    expect(res.body.error.fields.geometry[0]).toMatch(new RegExp(`at most ${MAX_REGION_VERTICES}`));
  });

  it('refuses a body of millions of points while it streams in (413)', async () => {
    // About 6 MB of positions: over the limit long before it could be parsed.
    const positions = Array.from({ length: 200_000 }, (_, i) => `[-128.${String(i).padStart(7, '0')},-47.${String(i).padStart(7, '0')}]`).join(',');
    const body = `{"name":"Huge","geometry":{"type":"Polygon","coordinates":[[${positions}]]}}`;
    const res = await call(createRegion, { user: admin, body, headers: { 'content-type': 'application/json' } });
    expect(res.status).toBe(413);
    expect(res.body.error.code).toBe('PAYLOAD_TOO_LARGE');
  });

  it.each(['99', '-1', 'x'])('answers 400 for zoom=%s', async (zoom) => {
    const res = await call(listRegions, { user: admin, url: `/api/regions?zoom=${zoom}` });
    expect(res.status).toBe(400);
    expect(res.body.error.fields.zoom).toBeDefined();
  });
});
