import { createHash } from 'node:crypto';
import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { writeArrayBuffer, type GeotiffWriterMetadata } from 'geotiff';
import { beforeEach, describe, expect, it } from 'vitest';
import { GET as listGrids, POST as uploadGrid } from '../../src/pages/api/elevation/index';
import { GET as getGrid, DELETE as deleteGrid } from '../../src/pages/api/elevation/[id]';
import { GET as sampleAt } from '../../src/pages/api/elevation/sample';
import { ROLES } from '../../src/lib/domain/roles';
import { config } from '../../src/lib/server/config';
import { call } from '../helpers/endpoint';
import { testDb, truncateAll } from '../helpers/db';
import { asSessionUser, makeUser } from '../helpers/factories';

/** 4 × 3 float32 cells over 7.0…7.4° E, 45.0…45.3° N (0.1° cells, PixelIsArea), values by hand. */
const CELLS = new Float32Array([
  100,
  110,
  120,
  130, // row centred on 45.25° N
  200,
  210,
  220,
  230, // 45.15° N
  300,
  310,
  -9999,
  330, // 45.05° N, one void
]);

function geoTiff(values: Float32Array, width: number, height: number, extra: Partial<GeotiffWriterMetadata> = {}): Uint8Array {
  return new Uint8Array(
    writeArrayBuffer(values, {
      width,
      height,
      ModelPixelScale: [0.1, 0.1, 0],
      ModelTiepoint: [0, 0, 0, 7.0, 45.3, 0],
      GTModelTypeGeoKey: 2,
      GTRasterTypeGeoKey: 1,
      GeographicTypeGeoKey: 4326,
      GDAL_NODATA: '-9999',
      ...extra,
    }),
  );
}

function multipart(name: string, bytes: Uint8Array | string, field = 'file'): FormData {
  const form = new FormData();
  form.set(field, new File([bytes as BlobPart], name));
  return form;
}

const sha256 = (bytes: Uint8Array) => createHash('sha256').update(bytes).digest('hex');

/** A synthetic 3″ .hgt tile: height = column, with a void at row 10, column 10. */
function hgtTile(): Uint8Array {
  const n = 1201;
  const bytes = new Uint8Array(n * n * 2);
  const view = new DataView(bytes.buffer);
  for (let r = 0; r < n; r++) for (let c = 0; c < n; c++) view.setInt16((r * n + c) * 2, c, false);
  view.setInt16((10 * n + 10) * 2, -32768, false);
  return bytes;
}

describe('elevation API', () => {
  beforeEach(truncateAll);

  async function admin() {
    return asSessionUser(await makeUser('admin'));
  }

  it('answers 401 to every route when signed out', async () => {
    for (const res of [
      await call(listGrids),
      await call(uploadGrid, { body: multipart('a.tif', geoTiff(CELLS, 4, 3)) }),
      await call(getGrid, { params: { id: '1' } }),
      await call(deleteGrid, { method: 'DELETE', params: { id: '1' } }),
      await call(sampleAt, { url: '/api/elevation/sample?lat=45&lon=7' }),
    ]) {
      expect(res.status).toBe(401);
      expect(res.body.error.code).toBe('UNAUTHORIZED');
    }
  });

  it.each(ROLES.filter((r) => r !== 'admin'))('lets a %s read but not upload or delete', async (role) => {
    const user = asSessionUser(await makeUser(role));
    expect((await call(listGrids, { user })).status).toBe(200);
    expect((await call(sampleAt, { user, url: '/api/elevation/sample?lat=45&lon=7' })).status).toBe(200);
    const up = await call(uploadGrid, { user, body: multipart('a.tif', geoTiff(CELLS, 4, 3)) });
    expect(up.status).toBe(403);
    expect(up.body.error.code).toBe('FORBIDDEN');
    const del = await call(deleteGrid, { method: 'DELETE', user, params: { id: '1' } });
    expect(del.status).toBe(403);
    expect(await testDb()('elevation_grids').count('* as n').first()).toEqual({ n: '0' });
  });

  it('imports a GeoTIFF written with the geotiff writer and samples the written values back', async () => {
    const user = await admin();
    const bytes = geoTiff(CELLS, 4, 3);
    const res = await call(uploadGrid, { user, body: multipart('valley.tif', bytes) });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({
      name: 'valley.tif',
      format: 'geotiff',
      width: 4,
      height: 3,
      registration: 'area',
      sample_type: 'float32',
      nodata: -9999,
      nodata_count: 1,
      min_m: 100,
      max_m: 330,
      byte_size: bytes.byteLength,
      sha256: sha256(bytes),
      resolution_arcsec: { lon: 360, lat: 360 },
      uploaded_by: { id: user.id, name: user.name },
    });
    expect(res.body.bbox.map((v: number) => Math.round(v * 1e9) / 1e9)).toEqual([7, 45, 7.4, 45.3]);

    const at = async (lat: number, lon: number) => (await call(sampleAt, { user, url: `/api/elevation/sample?lat=${lat}&lon=${lon}` })).body;
    // Cell centres give the written values exactly.
    expect(await at(45.25, 7.05)).toEqual({ lat: 45.25, lon: 7.05, height_m: 100, grid_id: res.body.id });
    expect((await at(45.15, 7.35)).height_m).toBe(230);
    // Half-way between four centres: their mean.
    expect((await at(45.2, 7.1)).height_m).toBeCloseTo((100 + 110 + 200 + 210) / 4, 6);
    // The void, and ground the grid does not cover.
    expect((await at(45.05, 7.25)).height_m).toBeNull();
    expect(await at(46, 7.2)).toEqual({ lat: 46, lon: 7.2, height_m: null, grid_id: null });

    const list = await call(listGrids, { user });
    expect(list.body).toMatchObject({ total: 1, items: [{ id: res.body.id, name: 'valley.tif' }] });
    expect((await call(getGrid, { user, params: { id: res.body.id } })).body.sha256).toBe(sha256(bytes));

    const row = await testDb()('elevation_grids').where({ id: res.body.id }).first();
    expect(existsSync(join(config.dataDir, 'elevation', row.samples_file))).toBe(true);
    const bounds = await testDb().raw('SELECT ST_AsText(ST_Envelope(bounds)) AS wkt FROM elevation_grids WHERE id = ?', [res.body.id]);
    expect(bounds.rows[0].wkt).toMatch(/^POLYGON\(\(7 45,7 45\.3/);
    const audit = await testDb()('audit_log').where({ entity: 'elevation_grid', entity_id: res.body.id }).first();
    expect(audit).toMatchObject({ action: 'create', user_id: user.id });
  });

  it('imports an SRTM .hgt tile: corner from the name, nodes on the edges, voids kept', async () => {
    const user = await admin();
    const res = await call(uploadGrid, { user, body: multipart('S48W129.hgt', hgtTile()) });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({
      format: 'hgt',
      width: 1201,
      height: 1201,
      registration: 'point',
      sample_type: 'int16',
      nodata: -32768,
      nodata_count: 1,
      bbox: [-129, -48, -128, -47],
    });
    const at = async (lat: number, lon: number) => (await call(sampleAt, { user, url: `/api/elevation/sample?lat=${lat}&lon=${lon}` })).body.height_m;
    expect(await at(-47.5, -129 + 300 / 1200)).toBe(300);
    expect(await at(-47.5, -128)).toBe(1200);
    expect(await at(-47 - 10 / 1200, -129 + 10 / 1200)).toBeNull();
  });

  it('refuses the same file twice with 409', async () => {
    const user = await admin();
    const bytes = geoTiff(CELLS, 4, 3);
    expect((await call(uploadGrid, { user, body: multipart('a.tif', bytes) })).status).toBe(201);
    const again = await call(uploadGrid, { user, body: multipart('copy.tif', bytes) });
    expect(again.status).toBe(409);
    expect(again.body.error.message).toContain('a.tif');
  });

  it('answers 413 for a file over 100 MB, before importing anything', async () => {
    const user = await admin();
    const res = await call(uploadGrid, { user, body: multipart('huge.tif', new Uint8Array(100 * 1024 * 1024 + 1)) });
    expect(res.status).toBe(413);
    expect(res.body.error.code).toBe('PAYLOAD_TOO_LARGE');
  });

  it.each([
    ['a text file', 'notes.txt', 'height,lat,lon\n1,2,3\n'],
    ['a zipped tile', 'N45E006.hgt.zip', 'PK\u0003\u0004'],
  ])('answers 415 for %s', async (_label, name, content) => {
    const res = await call(uploadGrid, { user: await admin(), body: multipart(name, content) });
    expect(res.status).toBe(415);
    expect(res.body.error.code).toBe('UNSUPPORTED_MEDIA_TYPE');
  });

  it('answers 415 for a body that is not multipart', async () => {
    const res = await call(uploadGrid, { user: await admin(), json: { file: 'N45E006.hgt' } });
    expect(res.status).toBe(415);
  });

  it('answers 400 with fields when the file field is missing or empty', async () => {
    const user = await admin();
    const missing = await call(uploadGrid, { user, body: multipart('a.tif', geoTiff(CELLS, 4, 3), 'upload') });
    expect(missing.status).toBe(400);
    expect(missing.body.error.fields.file).toBeDefined();
    const empty = await call(uploadGrid, { user, body: multipart('a.tif', '') });
    expect(empty.status).toBe(400);
    expect(empty.body.error.fields.file).toEqual(['The file is empty']);
  });

  it.each([
    ['a .tif that is not a TIFF', 'broken.tif', () => new TextEncoder().encode('not a tiff at all'), /not a readable TIFF/],
    [
      'a projected GeoTIFF',
      'utm.tif',
      () => geoTiff(CELLS, 4, 3, { GTModelTypeGeoKey: 1, ProjectedCSTypeGeoKey: 32632, GeographicTypeGeoKey: undefined }),
      /projected coordinate system \(EPSG:32632\); reproject it to EPSG:4326/,
    ],
    ['a GeoTIFF on another datum', 'nad27.tif', () => geoTiff(CELLS, 4, 3, { GeographicTypeGeoKey: 4267 }), /EPSG:4267; only EPSG:4326/],
    [
      'a TIFF without georeferencing',
      'plain.tif',
      () =>
        new Uint8Array(
          writeArrayBuffer(CELLS, { width: 4, height: 3, ProjectedCSTypeGeoKey: undefined, GeographicTypeGeoKey: undefined, ModelPixelScale: [1, 1, 0] }),
        ),
      /no georeferencing/,
    ],
    [
      'a three-band image',
      'rgb.tif',
      () => new Uint8Array(writeArrayBuffer([[[1, 2]], [[3, 4]], [[5, 6]]], { ModelPixelScale: [0.1, 0.1, 0], ModelTiepoint: [0, 0, 0, 7, 45, 0] })),
      /3 bands/,
    ],
    ['a .hgt of the wrong size', 'N45E006.hgt', () => new Uint8Array(1000), /1201 × 1201 or 3601 × 3601/],
    ['a .hgt without its corner in the name', 'tile.hgt', () => hgtTile(), /not a \.hgt tile name/],
  ])('answers 422 for %s and stores nothing', async (_label, name, bytes, message) => {
    const res = await call(uploadGrid, { user: await admin(), body: multipart(name, bytes()) });
    expect(res.status).toBe(422);
    expect(res.body.error.code).toBe('UNPROCESSABLE_CONTENT');
    expect(res.body.error.message).toMatch(message);
    expect(res.body.error.message.startsWith(`${name}: `)).toBe(true);
    expect(await testDb()('elevation_grids').count('* as n').first()).toEqual({ n: '0' });
  });

  it('deletes a grid with its samples file, audited; 404 after, 400 for a malformed id', async () => {
    const user = await admin();
    const created = (await call(uploadGrid, { user, body: multipart('a.tif', geoTiff(CELLS, 4, 3)) })).body;
    const row = await testDb()('elevation_grids').where({ id: created.id }).first();
    const res = await call(deleteGrid, { method: 'DELETE', user, params: { id: created.id } });
    expect(res.status).toBe(204);
    expect((await call(listGrids, { user })).body).toEqual({ items: [], total: 0 });
    expect(existsSync(join(config.dataDir, 'elevation', row.samples_file))).toBe(false);
    expect((await call(sampleAt, { user, url: '/api/elevation/sample?lat=45.25&lon=7.05' })).body.height_m).toBeNull();
    const audit = await testDb()('audit_log').where({ entity: 'elevation_grid', entity_id: created.id, action: 'delete' }).first();
    expect(audit.before).toMatchObject({ name: 'a.tif' });
    const again = await call(deleteGrid, { method: 'DELETE', user, params: { id: created.id } });
    expect(again.status).toBe(404);
    expect(again.body.error.code).toBe('NOT_FOUND');
    expect((await call(deleteGrid, { method: 'DELETE', user, params: { id: 'abc' } })).status).toBe(400);
  });

  it('keeps a samples file that another grid still uses', async () => {
    const user = await admin();
    // Same samples in two different files (the second carries an extra citation).
    const a = (await call(uploadGrid, { user, body: multipart('a.tif', geoTiff(CELLS, 4, 3)) })).body;
    const b = (await call(uploadGrid, { user, body: multipart('b.tif', geoTiff(CELLS, 4, 3, { GTCitationGeoKey: 'copy' })) })).body;
    expect(a.sha256).not.toBe(b.sha256);
    const rows = await testDb()('elevation_grids').orderBy('id');
    expect(rows[0].samples_file).toBe(rows[1].samples_file);
    expect((await call(deleteGrid, { method: 'DELETE', user, params: { id: a.id } })).status).toBe(204);
    expect(existsSync(join(config.dataDir, 'elevation', rows[1].samples_file))).toBe(true);
    expect((await call(sampleAt, { user, url: '/api/elevation/sample?lat=45.25&lon=7.05' })).body.height_m).toBe(100);
  });

  it('answers 400 with fields for a bad sample query', async () => {
    const user = await admin();
    const res = await call(sampleAt, { user, url: '/api/elevation/sample?lat=95&lon=abc' });
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields).sort()).toEqual(['lat', 'lon']);
  });
});
