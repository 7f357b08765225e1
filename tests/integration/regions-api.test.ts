import { beforeEach, describe, expect, it } from 'vitest';
import { GET as listRegions, POST as createRegion } from '../../src/pages/api/regions/index';
import { GET as getRegion, PATCH as patchRegion, DELETE as deleteRegion } from '../../src/pages/api/regions/[id]';
import { call } from '../helpers/endpoint';
import { testDb, truncateAll } from '../helpers/db';
import { asSessionUser, makeUser } from '../helpers/factories';
import { SEA_SQUARE, multiPolygon, polygon } from '../helpers/geojson';

// A 0.1° square in open sea near the demo island (counter-clockwise exterior ring, RFC 7946 §3.1.6).
const SQUARE = SEA_SQUARE;
// Self-intersecting "bow tie": well-formed GeoJSON, invalid as a polygon (OGC Simple Features).
const BOW_TIE = polygon([-128.6, -47.3], [-128.5, -47.2], [-128.5, -47.3], [-128.6, -47.2], [-128.6, -47.3]);

describe('regions API', () => {
  beforeEach(truncateAll);

  it('answers 401 signed out', async () => {
    expect((await call(listRegions)).status).toBe(401);
  });

  it('imports a GeoJSON polygon (bare or as a Feature) and returns it as a MultiPolygon with its area', async () => {
    const admin = asSessionUser(await makeUser('admin'));
    const res = await call(createRegion, { user: admin, json: { name: 'Test Fells', geometry: SQUARE } });
    expect(res.status).toBe(201);
    expect(res.body.geometry).toEqual({ type: 'MultiPolygon', coordinates: [SQUARE.coordinates] });
    // 0.1° × 0.1° at 47.25° S ≈ 11.12 km × 7.55 km ≈ 84 km² (spherical estimate; PostGIS uses the ellipsoid).
    expect(res.body.area_km2).toBeGreaterThan(80);
    expect(res.body.area_km2).toBeLessThan(88);
    const feature = await call(createRegion, { user: admin, json: { name: 'Wrapped', geometry: { type: 'Feature', properties: {}, geometry: SQUARE } } });
    expect(feature.status).toBe(201);
    const planner = asSessionUser(await makeUser('planner'));
    const list = await call(listRegions, { user: planner });
    expect(list.body.items.map((r: { name: string }) => r.name)).toEqual(['Test Fells', 'Wrapped']);
    expect(await testDb()('audit_log').where({ entity: 'region', action: 'create' }).count('* as n').first()).toEqual({ n: '2' });
  });

  it('refuses an invalid polygon with the reason PostGIS gives (400 fields.geometry)', async () => {
    const admin = asSessionUser(await makeUser('admin'));
    const res = await call(createRegion, { user: admin, json: { name: 'Bow tie', geometry: BOW_TIE } });
    expect(res.status).toBe(400);
    expect(res.body.error.fields.geometry[0]).toMatch(/Self-intersection/i);
    expect(await testDb()('regions').count('* as n').first()).toEqual({ n: '0' });
  });

  it.each([
    [{ name: 'Open', geometry: polygon([-128.6, -47.3], [-128.5, -47.3], [-128.5, -47.2], [-128.6, -47.2]) }, 'geometry.coordinates.0'],
    [{ name: 'Point', geometry: { type: 'Point', coordinates: [-128.6, -47.3] } }, 'geometry.type'],
    [{ name: 'Far', geometry: polygon([-128.6, -47.3], [-128.5, -97.3], [-128.5, -47.2], [-128.6, -47.3]) }, 'geometry.coordinates.0.1'],
    [{ geometry: SQUARE }, 'name'],
  ])('answers 400 with fields for malformed GeoJSON (%#)', async (body, field) => {
    const admin = asSessionUser(await makeUser('admin'));
    const res = await call(createRegion, { user: admin, json: body });
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields)).toContain(field);
  });

  it('renames, reshapes and deletes a region; 409 on a duplicate name; 404 afterwards', async () => {
    const admin = asSessionUser(await makeUser('admin'));
    const { id } = (await call(createRegion, { user: admin, json: { name: 'One', geometry: SQUARE } })).body;
    await call(createRegion, { user: admin, json: { name: 'Two', geometry: SQUARE } });
    expect((await call(patchRegion, { method: 'PATCH', user: admin, params: { id }, json: { name: 'two' } })).status).toBe(409);
    const smaller = multiPolygon([-128.6, -47.3], [-128.55, -47.3], [-128.55, -47.25], [-128.6, -47.3]);
    const res = await call(patchRegion, { method: 'PATCH', user: admin, params: { id }, json: { name: 'Uno', geometry: smaller } });
    expect(res.status).toBe(200);
    expect(res.body.name).toBe('Uno');
    expect(res.body.area_km2).toBeLessThan(20);
    expect((await call(patchRegion, { method: 'PATCH', user: admin, params: { id }, json: { geometry: BOW_TIE } })).status).toBe(400);
    expect((await call(deleteRegion, { method: 'DELETE', user: admin, params: { id } })).status).toBe(204);
    expect((await call(getRegion, { user: admin, params: { id } })).status).toBe(404);
  });

  it('refuses writes by non-admins (403)', async () => {
    const admin = asSessionUser(await makeUser('admin'));
    const { id } = (await call(createRegion, { user: admin, json: { name: 'One', geometry: SQUARE } })).body;
    for (const role of ['planner', 'reviewer', 'surveyor', 'contributor'] as const) {
      const user = asSessionUser(await makeUser(role));
      expect((await call(createRegion, { user, json: { name: role, geometry: SQUARE } })).status).toBe(403);
      expect((await call(patchRegion, { method: 'PATCH', user, params: { id }, json: { name: role } })).status).toBe(403);
      expect((await call(deleteRegion, { method: 'DELETE', user, params: { id } })).status).toBe(403);
      expect((await call(getRegion, { user, params: { id } })).status).toBe(200);
    }
  });
});
