import { beforeAll, describe, expect, it } from 'vitest';
import type { APIContext } from 'astro';
import { VectorTile } from '@mapbox/vector-tile';
import Pbf from 'pbf';
import { gunzipSync } from 'node:zlib';
import { GET as getTile } from '../../src/pages/api/tiles/[layer]/[z]/[x]/[y].mvt';
import { createOperator } from '../../src/lib/server/repos/operators';
import { createMast } from '../../src/lib/server/repos/masts';
import { createCell } from '../../src/lib/server/repos/cells';
import { CellInputSchema, MastInputSchema } from '../../src/lib/schemas/masts';
import type { SessionUser } from '../../src/lib/server/session-user';
import { testDb, truncateAll } from '../helpers/db';
import { asSessionUser, makeUser } from '../helpers/factories';

/**
 * The XYZ tile holding a WGS84 position: x = ⌊(λ + 180)/360 · 2^z⌋, y = ⌊(1 − ln(tan φ + sec φ)/π)/2 · 2^z⌋
 * (OGC / Web Mercator tile scheme, common practice of web maps).
 */
function tileOf(lat: number, lon: number, z: number) {
  const n = 2 ** z;
  const phi = (lat * Math.PI) / 180;
  return {
    z,
    x: Math.floor(((lon + 180) / 360) * n),
    y: Math.floor(((1 - Math.log(Math.tan(phi) + 1 / Math.cos(phi)) / Math.PI) / 2) * n),
  };
}

interface TileResult {
  status: number;
  headers: Headers;
  bytes: Uint8Array;
  json: any; // eslint-disable-line @typescript-eslint/no-explicit-any
}

/** Calls the tile endpoint like the router would; keeps the body as bytes (tests/helpers/endpoint.ts reads text). */
async function fetchTile(
  layer: string,
  t: { z: number | string; x: number | string; y: number | string },
  opts: { user?: SessionUser | null; query?: string; headers?: Record<string, string> } = {},
): Promise<TileResult> {
  const url = new URL(`/api/tiles/${layer}/${t.z}/${t.x}/${t.y}.mvt${opts.query ? `?${opts.query}` : ''}`, 'http://127.0.0.1:4321');
  const ctx = {
    request: new Request(url, { headers: opts.headers }),
    url,
    params: { layer, z: String(t.z), x: String(t.x), y: String(t.y) },
    locals: { user: opts.user ?? null, session: null },
  } as unknown as APIContext;
  const res = await getTile(ctx);
  const bytes = new Uint8Array(await res.arrayBuffer());
  const isJson = res.headers.get('content-type')?.includes('json');
  return { status: res.status, headers: res.headers, bytes, json: isJson ? JSON.parse(new TextDecoder().decode(bytes)) : null };
}

const decode = (bytes: Uint8Array) => new VectorTile(new Pbf(bytes));

const HILL = { lat: -47.2, lon: -128.5 };
const TOWN = { lat: -47.25, lon: -128.33 };

let contributor: SessionUser;
let ids: { op1: string; op2: string; hill: string; town: string; planned: string };

beforeAll(async () => {
  await truncateAll();
  const db = testDb();
  const geo = (g: unknown, multi = false) =>
    db.raw(multi ? 'ST_Multi(ST_SetSRID(ST_GeomFromGeoJSON(?), 4326))' : 'ST_SetSRID(ST_GeomFromGeoJSON(?), 4326)', [JSON.stringify(g)]);
  const box = (w: number, s: number, e: number, n: number) => ({
    type: 'Polygon',
    coordinates: [
      [
        [w, s],
        [e, s],
        [e, n],
        [w, n],
        [w, s],
      ],
    ],
  });
  await db('basemap_land').insert({ name: 'Test Island', kind: 'island', geom: geo(box(-128.8, -47.35, -128.2, -47.05), true) });
  await db('basemap_landuse').insert({ kind: 'wood', geom: geo(box(-128.52, -47.22, -128.48, -47.18), true) });
  await db('basemap_water').insert([
    { name: 'Test Lake', kind: 'lake', geom: geo(box(-128.46, -47.21, -128.44, -47.2)) },
    {
      name: 'Test River',
      kind: 'river',
      geom: geo({
        type: 'LineString',
        coordinates: [
          [-128.45, -47.2],
          [-128.4, -47.3],
        ],
      }),
    },
  ]);
  await db('basemap_roads').insert({
    name: 'Test Road',
    ref: 'R9',
    kind: 'primary',
    geom: geo({
      type: 'LineString',
      coordinates: [
        [-128.6, -47.2],
        [-128.33, -47.25],
      ],
    }),
  });
  await db('basemap_places').insert([
    { name: 'Testholm', kind: 'town', rank: 1, population: 1200, geom: geo({ type: 'Point', coordinates: [TOWN.lon, TOWN.lat] }) },
    { name: 'Test Knoll', kind: 'peak', rank: 3, ele_m: 512, geom: geo({ type: 'Point', coordinates: [HILL.lon + 0.01, HILL.lat] }) },
  ]);

  const op1 = (await createOperator(db, { name: 'Test Mobile A', mcc: '001', mnc: '01' }, null)).id;
  const op2 = (await createOperator(db, { name: 'Test Mobile B', mcc: '001', mnc: '02' }, null)).id;
  const mast = async (body: Record<string, unknown>) => (await createMast(db, MastInputSchema.parse(body), null)).id;
  const hill = await mast({ name: 'Test Hill', ...HILL, structure_type: 'lattice_tower' });
  const town = await mast({ name: 'Test Town', ...TOWN });
  const planned = await mast({ name: 'Test Planned', lat: -47.21, lon: -128.51, status: 'planned' });
  const cell = (mastId: string, body: Record<string, unknown>) => createCell(db, mastId, CellInputSchema.parse(body), null);
  await cell(hill, { operator_id: op1, tech: 'lte', channel: 1300, pci: 1 }); // B3, 1815 MHz
  await cell(hill, { operator_id: op1, tech: 'lte', channel: 6300, pci: 1 }); // B20, 806 MHz
  await cell(hill, { operator_id: op2, tech: 'nr', channel: 641280, pci: 2 }); // n78, 3619.2 MHz
  await cell(town, { operator_id: op2, tech: 'lte', channel: 100, pci: 3 }); // B1, 2120 MHz
  ids = { op1, op2, hill, town, planned };
  contributor = asSessionUser(await makeUser('contributor'));
});

describe('basemap tiles', () => {
  it('serve land, landuse, water, roads and places as MVT layers, to anyone', async () => {
    const res = await fetchTile('basemap', tileOf(HILL.lat, HILL.lon, 10));
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toBe('application/vnd.mapbox-vector-tile');
    expect(res.headers.get('cache-control')).toMatch(/^public, max-age=86400/);
    const tile = decode(res.bytes);
    expect(Object.keys(tile.layers).sort()).toEqual(['land', 'landuse', 'places', 'roads', 'water']);
    expect(tile.layers.land!.length).toBe(1);
    expect(tile.layers.land!.feature(0).properties).toEqual({ name: 'Test Island', kind: 'island' });
    expect(tile.layers.land!.feature(0).type).toBe(3);
    expect(tile.layers.landuse!.feature(0).properties).toEqual({ kind: 'wood' });
    const water = Array.from({ length: tile.layers.water!.length }, (_, i) => tile.layers.water!.feature(i));
    expect(water.map((f) => [f.properties.name, f.properties.kind, f.type]).sort()).toEqual([
      ['Test Lake', 'lake', 3],
      ['Test River', 'river', 2],
    ]);
    expect(tile.layers.roads!.feature(0).properties).toEqual({ name: 'Test Road', kind: 'primary', ref: 'R9' });
    const places = Array.from({ length: tile.layers.places!.length }, (_, i) => tile.layers.places!.feature(i).properties);
    expect(places).toContainEqual({ name: 'Testholm', kind: 'town', rank: 1, population: 1200 });
    expect(places).toContainEqual({ name: 'Test Knoll', kind: 'peak', rank: 3, ele_m: 512 });
  });

  it('puts features where they are (back-projected within a tile unit)', async () => {
    const t = tileOf(TOWN.lat, TOWN.lon, 12);
    const tile = decode((await fetchTile('basemap', t)).bytes);
    const places = tile.layers.places!;
    const town = Array.from({ length: places.length }, (_, i) => places.feature(i)).find((f) => f.properties.name === 'Testholm')!;
    const [lon, lat] = (town.toGeoJSON(t.x, t.y, t.z).geometry as { coordinates: number[] }).coordinates as [number, number];
    // One tile unit at z12 is 40075 km·cos φ / 2^12 / 4096 ≈ 1.6 m here.
    expect(lon).toBeCloseTo(TOWN.lon, 4);
    expect(lat).toBeCloseTo(TOWN.lat, 4);
  });

  it('covers the whole world at z0', async () => {
    const tile = decode((await fetchTile('basemap', { z: 0, x: 0, y: 0 })).bytes);
    expect(tile.layers.places!.length).toBe(2);
    expect(tile.layers.roads!.length).toBe(1);
  });

  it('answers 204 with no body for a tile with nothing in it', async () => {
    const res = await fetchTile('basemap', tileOf(10, 10, 10));
    expect(res.status).toBe(204);
    expect(res.bytes.length).toBe(0);
    expect(res.headers.get('cache-control')).toMatch(/max-age/);
  });

  it('answers 304 when the ETag still matches, 200 when it does not', async () => {
    const t = tileOf(HILL.lat, HILL.lon, 11);
    const first = await fetchTile('basemap', t);
    const etag = first.headers.get('etag')!;
    expect(etag).toMatch(/^".+"$/);
    const again = await fetchTile('basemap', t, { headers: { 'If-None-Match': etag } });
    expect(again.status).toBe(304);
    expect(again.bytes.length).toBe(0);
    expect(again.headers.get('etag')).toBe(etag);
    expect((await fetchTile('basemap', t, { headers: { 'If-None-Match': `"other", W/${etag}` } })).status).toBe(304);
    expect((await fetchTile('basemap', t, { headers: { 'If-None-Match': '"other"' } })).status).toBe(200);
  });

  // XYZ ranges: z 0–22, x and y 0 … 2^z − 1 (OGC / Web Mercator tile scheme, common practice).
  it.each([
    ['basemap', { z: 23, x: 0, y: 0 }, 'z'],
    ['basemap', { z: 3, x: 8, y: 0 }, 'x'],
    ['basemap', { z: 3, x: 0, y: 8 }, 'y'],
    ['basemap', { z: 0, x: 0, y: -1 }, 'y'],
    ['basemap', { z: 'a', x: 0, y: 0 }, 'z'],
    ['roads', { z: 0, x: 0, y: 0 }, 'layer'],
  ])('answers 400 with fields for %s %o', async (layer, t, field) => {
    const res = await fetchTile(layer, t);
    expect(res.status).toBe(400);
    expect(res.json.error.code).toBe('BAD_REQUEST');
    expect(Object.keys(res.json.error.fields)).toEqual([field]);
  });
});

describe('mast tiles', () => {
  const masts = (bytes: Uint8Array) => {
    const layer = decode(bytes).layers.masts;
    return layer ? Array.from({ length: layer.length }, (_, i) => layer.feature(i)) : [];
  };

  it('need a signed-in user (401) and stay private', async () => {
    const t = tileOf(HILL.lat, HILL.lon, 9);
    const anonymous = await fetchTile('masts', t);
    expect(anonymous.status).toBe(401);
    expect(anonymous.json.error.code).toBe('UNAUTHORIZED');
    const res = await fetchTile('masts', t, { user: contributor });
    expect(res.status).toBe(200);
    expect(res.headers.get('cache-control')).toBe('private, max-age=60');
  });

  it('carry id, name, status, operators, bands and technologies per mast', async () => {
    const features = masts((await fetchTile('masts', tileOf(HILL.lat, HILL.lon, 9), { user: contributor })).bytes);
    expect(Object.keys(decode((await fetchTile('masts', tileOf(HILL.lat, HILL.lon, 9), { user: contributor })).bytes).layers)).toEqual(['masts']);
    expect(features).toHaveLength(3);
    const hill = features.find((f) => f.properties.name === 'Test Hill')!;
    expect(hill.id).toBe(Number(ids.hill));
    expect(hill.type).toBe(1);
    expect(hill.properties).toEqual({
      id: Number(ids.hill),
      name: 'Test Hill',
      status: 'active',
      structure_type: 'lattice_tower',
      op_ids: `${ids.op1},${ids.op2}`,
      op_count: 2,
      bands: 'B20,B3,n78',
      techs: 'lte,nr',
      cell_count: 3,
    });
    const planned = features.find((f) => f.properties.name === 'Test Planned')!;
    expect(planned.properties).toMatchObject({ status: 'planned', op_ids: '', op_count: 0, bands: '', techs: '', cell_count: 0 });
  });

  it.each([
    ['operator=OP1', ['Test Hill']],
    ['operator=OP2', ['Test Hill', 'Test Town']],
    ['band=B1', ['Test Town']],
    ['tech=nr', ['Test Hill']],
    ['status=planned', ['Test Planned']],
    ['operator=OP1&band=B1', []],
  ])('apply the filter %s', async (query, expected) => {
    const q = query.replace('OP1', ids.op1).replace('OP2', ids.op2);
    const res = await fetchTile('masts', tileOf(HILL.lat, HILL.lon, 9), { user: contributor, query: q });
    if (expected.length === 0) {
      expect(res.status).toBe(204);
      return;
    }
    expect(
      masts(res.bytes)
        .map((f) => f.properties.name)
        .sort(),
    ).toEqual(expected);
  });

  it('give a different ETag for a different filter', async () => {
    const t = tileOf(HILL.lat, HILL.lon, 9);
    const all = await fetchTile('masts', t, { user: contributor });
    const some = await fetchTile('masts', t, { user: contributor, query: `operator=${ids.op1}` });
    expect(all.headers.get('etag')).not.toBe(some.headers.get('etag'));
  });

  it('answer 400 for a bad filter', async () => {
    const res = await fetchTile('masts', tileOf(HILL.lat, HILL.lon, 9), { user: contributor, query: 'status=gone&band=B99' });
    expect(res.status).toBe(400);
    expect(Object.keys(res.json.error.fields).sort()).toEqual(['band', 'status']);
  });

  it('answer 204 where there are no masts', async () => {
    expect((await fetchTile('masts', tileOf(10, 10, 12), { user: contributor })).status).toBe(204);
  });
});

describe('mast tiles zoomed out, cached and compressed', () => {
  const layerFeatures = (bytes: Uint8Array, name: string) => {
    const layer = decode(bytes).layers[name];
    return layer ? Array.from({ length: layer.length }, (_, i) => layer.feature(i)) : [];
  };
  const FAR = { lat: -40.5, lon: -120.5 };

  it('draw masts sharing a grid square as one cluster with a count below zoom 9, and lone masts as masts', async () => {
    const db = testDb();
    const mast = async (name: string, lat: number, lon: number) => (await createMast(db, MastInputSchema.parse({ name, lat, lon }), null)).id;
    // Three masts within about 300 m of each other, one 60 km away (another grid square of the same z5 tile).
    await mast('Cluster A', FAR.lat, FAR.lon);
    await mast('Cluster B', FAR.lat + 0.002, FAR.lon + 0.002);
    await mast('Cluster C', FAR.lat - 0.001, FAR.lon + 0.003);
    await mast('Far Lone', FAR.lat, FAR.lon - 0.7);
    const t = tileOf(FAR.lat, FAR.lon, 5);
    const res = await fetchTile('masts', t, { user: contributor });
    expect(res.status).toBe(200);
    const clusters = layerFeatures(res.bytes, 'mast_clusters');
    expect(clusters.map((f) => f.properties.point_count)).toEqual([3]);
    // At their mean position (one tile unit at z5 is about 300 m here).
    const [lon, lat] = (clusters[0]!.toGeoJSON(t.x, t.y, t.z).geometry as { coordinates: number[] }).coordinates as [number, number];
    expect(lat).toBeCloseTo(FAR.lat + 0.00033, 2);
    expect(lon).toBeCloseTo(FAR.lon + 0.00167, 2);
    expect(layerFeatures(res.bytes, 'masts').map((f) => f.properties.name)).toEqual(['Far Lone']);
    // From zoom 9 on every mast is its own feature.
    const close = await fetchTile('masts', tileOf(FAR.lat, FAR.lon, 9), { user: contributor });
    expect(
      layerFeatures(close.bytes, 'masts')
        .map((f) => f.properties.name)
        .sort(),
    ).toEqual(['Cluster A', 'Cluster B', 'Cluster C']);
    expect(layerFeatures(close.bytes, 'mast_clusters')).toEqual([]);
  });

  it('count only the masts the filter keeps in the clusters, and say when the tile came from the cache', async () => {
    const db = testDb();
    const t = tileOf(FAR.lat, FAR.lon, 5);
    const [b] = await db('masts').where({ name: 'Cluster B' }).pluck('id');
    const [c] = await db('masts').where({ name: 'Cluster C' }).pluck('id');
    await db('masts').where({ id: c }).update({ status: 'planned' });
    await createCell(db, String(b), CellInputSchema.parse({ operator_id: ids.op2, tech: 'nr', channel: 641280, pci: 9 }), null);
    const counts = async (query?: string) => {
      const res = await fetchTile('masts', t, { user: contributor, query });
      return {
        clusters: layerFeatures(res.bytes, 'mast_clusters').map((f) => f.properties.point_count),
        masts: layerFeatures(res.bytes, 'masts').map((f) => f.properties.name),
        cache: res.headers.get('x-tile-cache'),
      };
    };
    expect(await counts()).toMatchObject({ clusters: [3], cache: 'miss' });
    expect(await counts()).toMatchObject({ clusters: [3], cache: 'hit' });
    // Active only: A and B stay together, the planned C leaves the cluster.
    expect(await counts('status=active')).toMatchObject({ clusters: [2], masts: ['Far Lone'] });
    // Only B has an NR cell: no cluster is left, B is drawn alone.
    expect(await counts('tech=nr')).toMatchObject({ clusters: [], masts: ['Cluster B'] });
    expect(await counts(`operator=${ids.op2}&band=n78`)).toMatchObject({ clusters: [], masts: ['Cluster B'] });
    await db('cells').where({ mast_id: b }).delete();
    await db('masts').where({ id: c }).update({ status: 'active' });
  });

  it('cut unfiltered low zooms from squares counted ahead, which follow inserts, moves and deletes', async () => {
    const db = testDb();
    const mast = async (name: string, lat: number, lon: number) => (await createMast(db, MastInputSchema.parse({ name, lat, lon }), null)).id;
    const near = await mast('Square D', FAR.lat + 0.001, FAR.lon - 0.001);
    const mover = await mast('Square E', FAR.lat + 0.5, FAR.lon + 0.5);
    // The unfiltered tile reads mast_cluster_squares; asking for every status takes the grouping query.
    // Both must draw the same clusters at the same places, and the same lone masts.
    const both = async (z: number) => {
      const t = tileOf(FAR.lat, FAR.lon, z);
      const view = async (query?: string) => {
        const bytes = (await fetchTile('masts', t, { user: contributor, query })).bytes;
        return {
          clusters: layerFeatures(bytes, 'mast_clusters')
            .map((f) => `${f.properties.point_count}@${JSON.stringify(f.loadGeometry())}`)
            .sort(),
          masts: layerFeatures(bytes, 'masts')
            .map((f) => f.properties.name)
            .sort(),
        };
      };
      return { counted: await view(), grouped: await view('status=active,planned,decommissioned') };
    };
    const counts = async () => Number((await db('mast_cluster_squares').where({ zoom: 5 }).sum('n as n'))[0]!.n);
    const total = Number((await db('masts').count('* as n'))[0]!.n);
    expect(await counts()).toBe(total);
    for (const z of [3, 5, 8]) {
      const { counted, grouped } = await both(z);
      expect(counted).toEqual(grouped);
    }
    expect((await both(5)).counted.clusters.map((c) => c.split('@')[0])).toEqual(['4']);
    // A move takes the mast out of one square and into another; a rename changes no count.
    await db('masts')
      .where({ id: mover })
      .update({ geom: db.raw('ST_SetSRID(ST_MakePoint(?, ?), 4326)', [FAR.lon + 0.002, FAR.lat - 0.002]) });
    await db('masts').where({ id: near }).update({ name: 'Square D renamed' });
    expect(await counts()).toBe(total);
    const moved = await both(5);
    expect(moved.counted).toEqual(moved.grouped);
    expect(moved.counted.clusters.map((c) => c.split('@')[0])).toEqual(['5']);
    await db('masts').whereIn('id', [near, mover]).delete();
    expect(await counts()).toBe(total - 2);
    const after = await both(5);
    expect(after.counted).toEqual(after.grouped);
    expect(after.counted.clusters.map((c) => c.split('@')[0])).toEqual(['3']);
    // Emptied squares go: none is left with a count of zero or less.
    expect(Number((await db('mast_cluster_squares').where('n', '<=', 0).count('* as n'))[0]!.n)).toBe(0);
  });

  it('show every cell write at once although tiles are cached (the summary follows the cells)', async () => {
    const db = testDb();
    const t = tileOf(FAR.lat, FAR.lon, 12);
    const clusterA = async () =>
      layerFeatures((await fetchTile('masts', t, { user: contributor })).bytes, 'masts').find((f) => f.properties.name === 'Cluster A')!;
    expect((await clusterA()).properties).toMatchObject({ cell_count: 0, bands: '' });
    expect((await clusterA()).properties).toMatchObject({ cell_count: 0 }); // served from the cache
    const mastId = String((await clusterA()).properties.id);
    const cell = await createCell(db, mastId, CellInputSchema.parse({ operator_id: ids.op1, tech: 'lte', channel: 6300, pci: 5 }), null);
    expect((await clusterA()).properties).toMatchObject({ cell_count: 1, bands: 'B20', techs: 'lte', op_ids: ids.op1 });
    await db('cells').where({ id: cell.id }).update({ operator_id: ids.op2 });
    expect((await clusterA()).properties).toMatchObject({ cell_count: 1, op_ids: ids.op2 });
    await db('cells').where({ id: cell.id }).delete();
    expect((await clusterA()).properties).toMatchObject({ cell_count: 0, bands: '', op_ids: '' });
  });

  it('come gzipped to clients that accept it, identical once unzipped', async () => {
    const t = tileOf(HILL.lat, HILL.lon, 9);
    const plain = await fetchTile('masts', t, { user: contributor });
    const zipped = await fetchTile('masts', t, { user: contributor, headers: { 'Accept-Encoding': 'gzip, deflate, br' } });
    expect(plain.headers.get('content-encoding')).toBeNull();
    expect(zipped.headers.get('content-encoding')).toBe('gzip');
    expect(zipped.headers.get('vary')).toBe('Accept-Encoding');
    expect(Buffer.from(gunzipSync(zipped.bytes)).equals(Buffer.from(plain.bytes))).toBe(true);
    expect(zipped.headers.get('etag')).toBe(plain.headers.get('etag'));
    const refused = await fetchTile('masts', t, { user: contributor, headers: { 'Accept-Encoding': 'gzip;q=0' } });
    expect(refused.headers.get('content-encoding')).toBeNull();
  });
});
