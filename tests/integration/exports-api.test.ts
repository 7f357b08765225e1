import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import Papa from 'papaparse';
import { XMLParser } from 'fast-xml-parser';
import { check } from '@placemarkio/check-geojson';
import type { FeatureCollection, Point, Polygon } from 'geojson';
import { GET as exportFile } from '../../src/pages/api/export/[file]';
import { config } from '../../src/lib/server/config';
import { refreshReadingHexes } from '../../src/lib/server/repos/reading-hexes';
import { createMast } from '../../src/lib/server/repos/masts';
import { MastInputSchema } from '../../src/lib/schemas/masts';
import { call, type CallResult } from '../helpers/endpoint';
import { testDb, truncateAll } from '../helpers/db';
import { asSessionUser, makeUser } from '../helpers/factories';
import { buildRegionFixture, type RegionFixture } from '../helpers/region-fixture';

type User = ReturnType<typeof asSessionUser>;

const get = (user: User | null, file: string, query = '') =>
  call(exportFile, { user, params: { file }, url: `/api/export/${file}${query ? `?${query}` : ''}` });

/** CSV as RFC 4180 says, read back with papaparse (numbers as numbers). */
function csvRows(res: CallResult): Array<Record<string, unknown>> {
  const parsed = Papa.parse<Record<string, unknown>>(res.text, { header: true, dynamicTyping: true, skipEmptyLines: true });
  expect(parsed.errors).toEqual([]);
  return parsed.data;
}

/** GeoJSON checked by check-geojson (RFC 7946 structure), then as a FeatureCollection. */
function geojson<G extends Point | Polygon>(res: CallResult): FeatureCollection<G> {
  const parsed = check(res.text) as FeatureCollection<G>;
  expect(parsed.type).toBe('FeatureCollection');
  return parsed;
}

/** KML parsed as XML: the placemarks of its one Document (OGC KML 2.2). */
function placemarks(res: CallResult): Array<Record<string, unknown>> {
  const xml = new XMLParser({ ignoreAttributes: false, isArray: (name) => name === 'Placemark' || name === 'Data' });
  const doc = xml.parse(res.text, true) as { kml: { '@_xmlns': string; Document: { Placemark?: Array<Record<string, unknown>> } } };
  expect(doc.kml['@_xmlns']).toBe('http://www.opengis.net/kml/2.2');
  return doc.kml.Document.Placemark ?? [];
}

const extended = (p: Record<string, unknown>) =>
  Object.fromEntries(((p.ExtendedData as { Data: Array<{ '@_name': string; value: unknown }> }).Data ?? []).map((d) => [d['@_name'], d.value]));

describe('exports API', () => {
  let f: RegionFixture;
  let planner: User;
  let reviewer: User;
  const configuredMax = config.exportMaxRows;
  beforeEach(async () => {
    await truncateAll();
    f = await buildRegionFixture();
    planner = asSessionUser(await makeUser('planner'));
    reviewer = asSessionUser(await makeUser('reviewer'));
  });
  afterEach(() => {
    config.exportMaxRows = configuredMax;
  });

  describe('guards and bad input', () => {
    it('answers 401 signed out, in the error shape', async () => {
      const res = await get(null, 'masts.csv');
      expect(res.status).toBe(401);
      expect(res.body).toEqual({ error: { code: 'UNAUTHORIZED', message: expect.any(String) } });
    });

    it.each([
      ['towers.csv', 'file'],
      ['masts.xlsx', 'file'],
      ['masts', 'file'],
      ['masts.csv.kml', 'file'],
    ])('refuses %s with 400 naming the %s', async (file, field) => {
      const res = await get(planner, file);
      expect(res.status).toBe(400);
      expect(res.body.error).toMatchObject({ code: 'BAD_REQUEST', fields: { [field]: [expect.any(String)] } });
    });

    it.each([
      ['masts.csv', 'band=B99', 'band'],
      ['cells.geojson', 'tech=6g', 'tech'],
      ['readings.csv', 'status=lost', 'status'],
      ['readings.csv', 'operator=abc', 'operator'],
      ['masts.kml', 'bbox=1,2,3', 'bbox'],
      ['masts.csv', 'region=01', 'region'],
      ['readings.csv', 'limit=0', 'limit'],
      ['readings.csv', 'after=x', 'after'],
      ['readings-hexagons.csv', 'level=9', 'level'],
      ['readings-hexagons.csv', 'tech=lte', 'tech'],
      ['readings-hexagons.csv', 'operator=1,2', 'operator'],
      ['readings-hexagons.csv', 'operator=1&band=20', 'band'],
      ['readings-hexagons.csv', 'band=B20', 'band'],
      ['readings-hexagons.csv', 'after=5', 'after'],
    ])('%s?%s is a 400 naming %s', async (file, query, field) => {
      const res = await get(planner, file, query);
      expect(res.status).toBe(400);
      expect(res.body.error).toMatchObject({ code: 'BAD_REQUEST', fields: { [field]: [expect.any(String)] } });
    });

    it('answers 404 for a region that does not exist', async () => {
      const res = await get(planner, 'masts.geojson', 'region=999999');
      expect(res.status).toBe(404);
      expect(res.body.error.code).toBe('NOT_FOUND');
    });
  });

  describe('masts', () => {
    it('writes CSV that papaparse reads back, with a download file name', async () => {
      const res = await get(planner, 'masts.csv', `region=${f.region}`);
      expect(res.status).toBe(200);
      expect(res.headers.get('content-type')).toBe('text/csv; charset=utf-8');
      expect(res.headers.get('content-disposition')).toMatch(new RegExp(`^attachment; filename="bearline-masts-region-${f.region}-\\d{8}\\.csv"$`));
      const rows = csvRows(res);
      expect(rows.map((r) => r.name)).toEqual(['Test Hill', 'Test Planned']);
      expect(rows[0]).toMatchObject({ id: Number(f.hill), reference: 'TST-001', status: 'active', lat: -47.2, lon: -128.5, cell_count: 2 });
      expect(rows[0]!.operators).toBe('Test Mobile A; Test Mobile B');
      expect(Object.keys(rows[0]!)).not.toContain('geometry');
    });

    it('writes valid GeoJSON (RFC 7946: lon before lat, no crs member)', async () => {
      const res = await get(planner, 'masts.geojson', `region=${f.region}`);
      expect(res.headers.get('content-type')).toBe('application/geo+json; charset=utf-8');
      const fc = geojson<Point>(res);
      expect(fc).not.toHaveProperty('crs');
      expect(fc.features).toHaveLength(2);
      expect(fc.features[0]).toMatchObject({ type: 'Feature', geometry: { type: 'Point', coordinates: [-128.5, -47.2] }, properties: { name: 'Test Hill' } });
      expect(fc.features[0]!.properties).not.toHaveProperty('lat');
    });

    it('writes KML 2.2 with one placemark per mast', async () => {
      const res = await get(planner, 'masts.kml', `region=${f.region}`);
      expect(res.headers.get('content-type')).toBe('application/vnd.google-earth.kml+xml; charset=utf-8');
      expect(res.text.startsWith('<?xml version="1.0" encoding="UTF-8"?>')).toBe(true);
      const marks = placemarks(res);
      expect(marks.map((p) => p.name)).toEqual(['Test Hill', 'Test Planned']);
      expect((marks[0]!.Point as { coordinates: string }).coordinates).toBe('-128.5,-47.2');
      expect(extended(marks[0]!)).toMatchObject({ status: 'active', reference: 'TST-001' });
    });

    it('filters like the map: status, operator, band and bbox', async () => {
      const names = async (query: string) => csvRows(await get(planner, 'masts.csv', query)).map((r) => r.name);
      expect(await names('')).toEqual(['Test Hill', 'Test Planned', 'Test Outside']);
      expect(await names('status=decommissioned')).toEqual(['Test Outside']);
      expect(await names(`operator=${f.opB}`)).toEqual(['Test Hill']);
      expect(await names('band=B3')).toEqual(['Test Planned']);
      expect(await names('bbox=-128.6,-47.3,-128.52,-47.1')).toEqual(['Test Planned']);
      expect(await names(`region=${f.emptyRegion}`)).toEqual([]);
    });

    it('keeps text that a spreadsheet would run as a formula from running (prefixed with a quote)', async () => {
      await createMast(testDb(), MastInputSchema.parse({ name: '=HYPERLINK("http://example.test")', lat: -47.15, lon: -128.45 }), null);
      const res = await get(planner, 'masts.csv', `region=${f.region}`);
      expect(csvRows(res).map((r) => r.name)).toContain(`'=HYPERLINK("http://example.test")`);
    });
  });

  describe('cells', () => {
    it('filters by operator, technology, band, mast status and area, in three formats', async () => {
      const ids = async (query: string) => csvRows(await get(planner, 'cells.csv', query)).map((r) => String(r.id));
      expect(await ids(`region=${f.region}`)).toEqual([f.hillB20, f.hillN78, f.plannedB3]);
      expect(await ids(`operator=${f.opB}`)).toEqual([f.hillN78]);
      expect(await ids('tech=lte&status=active')).toEqual([f.hillB20]);
      expect(await ids('band=B20')).toEqual([f.hillB20, f.outsideB20]);
      const fc = geojson<Point>(await get(planner, 'cells.geojson', `region=${f.region}&tech=nr`));
      expect(fc.features.map((x) => x.properties)).toEqual([expect.objectContaining({ id: f.hillN78, operator: 'Test Mobile B', band: 'n78', pci: 900 })]);
      const marks = placemarks(await get(planner, 'cells.kml', 'band=B3'));
      expect(marks.map((p) => p.name)).toEqual(['Test Mobile A LTE B3 ch 1300 PCI 5']);
    });
  });

  describe('readings', () => {
    it('leaves out readings taken at customers’ homes for roles that may not see customers', async () => {
      expect(csvRows(await get(planner, 'readings.csv', `region=${f.region}`))).toHaveLength(4);
      const forReviewer = csvRows(await get(reviewer, 'readings.csv', `region=${f.region}`));
      expect(forReviewer).toHaveLength(3);
      expect(forReviewer.map((r) => r.source)).not.toContain('install_check');
      expect(geojson<Point>(await get(reviewer, 'readings.geojson')).features).toHaveLength(4);
      expect(placemarks(await get(planner, 'readings.kml'))).toHaveLength(5);
    });

    it('filters: technology on the reading, operator, band and status on its matched cell', async () => {
      const count = async (query: string) => csvRows(await get(reviewer, 'readings.csv', query)).length;
      expect(await count('tech=nr')).toBe(1);
      expect(await count(`operator=${f.opA}`)).toBe(3);
      expect(await count(`operator=${f.opA}&region=${f.region}`)).toBe(2);
      expect(await count('band=n78')).toBe(0);
      expect(await count('status=decommissioned')).toBe(1);
      expect(await count('bbox=-128.6,-47.3,-128.5,-47.2')).toBe(2);
    });

    it('writes every row of a set larger than one batch, in order', async () => {
      await testDb().raw(
        `INSERT INTO readings (taken_at, geom, tech, channel, pci, rsrp_dbm)
         SELECT timestamptz '2026-11-25T00:00:00Z' + n * interval '1 second', ST_SetSRID(ST_MakePoint(-128.45 - n * 0.00001, -47.15), 4326), 'lte', 6300, 101, -60 - n % 60
           FROM generate_series(1, 1234) n`,
      );
      const rows = csvRows(await get(reviewer, 'readings.csv', `region=${f.region}`));
      expect(rows).toHaveLength(1237);
      const ids = rows.map((r) => Number(r.id));
      expect(ids).toEqual([...ids].sort((a, b) => a - b));
      expect(geojson<Point>(await get(reviewer, 'readings.geojson', `region=${f.region}`)).features).toHaveLength(1237);
      expect(placemarks(await get(reviewer, 'readings.kml', `region=${f.region}`))).toHaveLength(1237);
    });

    it('refuses more rows than one file may hold with 422, and pages with limit and after', async () => {
      config.exportMaxRows = 3;
      const tooMany = await get(planner, 'readings.csv', `region=${f.region}`);
      expect(tooMany.status).toBe(422);
      expect(tooMany.body.error).toMatchObject({ code: 'UNPROCESSABLE_CONTENT', message: expect.stringMatching(/More than 3 readings match/) });
      const overCap = await get(planner, 'readings.csv', 'limit=4');
      expect(overCap.status).toBe(400);
      expect(overCap.body.error.fields.limit).toEqual(['At most 3 rows per file']);

      const first = await get(planner, 'readings.csv', `region=${f.region}&limit=3`);
      expect(first.status).toBe(200);
      const firstIds = csvRows(first).map((r) => String(r.id));
      expect(firstIds).toHaveLength(3);
      expect(first.headers.get('x-next-after')).toBe(firstIds[2]);
      const second = await get(planner, 'readings.csv', `region=${f.region}&limit=3&after=${firstIds[2]}`);
      expect(second.headers.get('content-disposition')).toContain(`-after-${firstIds[2]}-`);
      expect(second.headers.get('x-next-after')).toBeNull();
      const secondIds = csvRows(second).map((r) => String(r.id));
      expect(secondIds).toHaveLength(1);
      expect(new Set([...firstIds, ...secondIds]).size).toBe(4);
    });
  });

  describe('readings by hexagon', () => {
    beforeEach(async () => {
      await refreshReadingHexes(testDb());
    });

    it('exports the signal map’s hexagons with counts and medians; homes only for roles that may see customers', async () => {
      const forPlanner = csvRows(await get(planner, 'readings-hexagons.csv', `region=${f.region}`));
      expect(forPlanner.reduce((sum, r) => sum + Number(r.readings), 0)).toBe(4);
      expect(forPlanner.every((r) => r.level === 3)).toBe(true);
      expect(Object.keys(forPlanner[0]!)).not.toContain('geometry');
      const forReviewer = csvRows(await get(reviewer, 'readings-hexagons.csv', `region=${f.region}`));
      expect(forReviewer.reduce((sum, r) => sum + Number(r.readings), 0)).toBe(3);
      // The reading of −85 dBm sits alone in its hexagon: its median is itself, graded good (common practice grades).
      expect(forReviewer.find((r) => r.median_rsrp_dbm === -85)).toMatchObject({ readings: 1, rsrp_grade: 'good' });
    });

    it('writes hexagons as GeoJSON polygons and KML, filtered by operator and band', async () => {
      const fc = geojson<Polygon>(await get(reviewer, 'readings-hexagons.geojson', `region=${f.region}&level=2`));
      expect(fc.features.length).toBeGreaterThan(0);
      for (const hex of fc.features) {
        expect(hex.geometry.type).toBe('Polygon');
        expect(hex.geometry.coordinates[0]).toHaveLength(7);
      }
      expect(fc.features.reduce((sum, x) => sum + Number(x.properties!.readings), 0)).toBe(3);
      const opB = csvRows(await get(reviewer, 'readings-hexagons.csv', `operator=${f.opB}`));
      expect(opB).toEqual([]);
      const b20 = csvRows(await get(reviewer, 'readings-hexagons.csv', `band=B20&operator=${f.opA}`));
      expect(b20.reduce((sum, r) => sum + Number(r.readings), 0)).toBe(3);
      const marks = placemarks(await get(planner, 'readings-hexagons.kml', `region=${f.region}`));
      expect(marks).toHaveLength(csvRows(await get(planner, 'readings-hexagons.csv', `region=${f.region}`)).length);
      expect(marks[0]).toHaveProperty('Polygon');
      expect(marks[0]!.name).toMatch(/^\d+ readings, median RSRP -?\d+ dBm$/);
    });
  });
});
