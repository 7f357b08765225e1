// File formats of the exports, written a batch of rows at a time so that a large layer never sits
// in memory whole: CSV (RFC 4180, written by papaparse), GeoJSON (RFC 7946: one FeatureCollection,
// WGS84 lon/lat, features built by the `geojson` package) and KML (OGC KML 2.2, placemarks written by
// @placemarkio/tokml inside one Document).
import { createRequire } from 'node:module';
import Papa from 'papaparse';
import { toKML } from '@placemarkio/tokml';
import type { Feature, FeatureCollection, Geometry } from 'geojson';
import type { ExportFormat } from '../schemas/exports';
import type { ExportLayerSpec, ExportRow } from './repos/export-layers';

interface GeoJsonBuilder {
  parse(rows: ExportRow[], params: { Point?: [string, string]; GeoJSON?: string; include?: string[] }): FeatureCollection<Geometry | null>;
}
// The `geojson` package is CommonJS without its own types (@types/geojson names the format's types,
// not this package), so it is loaded through require.
const GeoJSON = createRequire(import.meta.url)('geojson') as GeoJsonBuilder;

export interface ExportWriter {
  head(): string;
  rows(batch: ExportRow[]): string;
  tail(): string;
}

/** Properties written for each feature: every column but the geometry ones. */
function propertyColumns(spec: ExportLayerSpec): string[] {
  return spec.columns.filter((c) => (spec.shape === 'point' ? c !== 'lat' && c !== 'lon' : c !== 'geometry'));
}

function toFeatures(spec: ExportLayerSpec, batch: ExportRow[]): Feature<Geometry | null>[] {
  const include = propertyColumns(spec);
  const params = spec.shape === 'point' ? { Point: ['lat', 'lon'] as [string, string], include } : { GeoJSON: 'geometry', include };
  return GeoJSON.parse(batch, params).features;
}

function csvWriter(spec: ExportLayerSpec): ExportWriter {
  const columns = spec.columns.filter((c) => c !== 'geometry');
  // escapeFormulae: text starting with = + - @ is prefixed with ' so spreadsheets never run it
  // (OWASP "CSV injection", common practice); numbers are written as they are.
  const unparse = (data: unknown[][], header: boolean) => Papa.unparse({ fields: columns, data }, { header, escapeFormulae: true, newline: '\r\n' });
  return {
    head: () => `${unparse([], true).replace(/\r\n$/, '')}\r\n`,
    rows: (batch) =>
      `${unparse(
        batch.map((r) => columns.map((c) => r[c] ?? null)),
        false,
      )}\r\n`,
    tail: () => '',
  };
}

function geojsonWriter(spec: ExportLayerSpec): ExportWriter {
  let first = true;
  return {
    head: () => '{"type":"FeatureCollection","features":[\n',
    rows: (batch) => {
      const text = toFeatures(spec, batch)
        .map((f) => JSON.stringify(f))
        .join(',\n');
      const out = first ? text : `,\n${text}`;
      first = false;
      return out;
    },
    tail: () => '\n]}\n',
  };
}

const KML_OPEN = '<kml xmlns="http://www.opengis.net/kml/2.2"><Document>';
const KML_CLOSE = '</Document></kml>';

const escapeXml = (text: string) => text.replace(/[<>&'"]/g, (c) => `&#${c.charCodeAt(0)};`);

function kmlWriter(spec: ExportLayerSpec, title: string): ExportWriter {
  return {
    head: () => `<?xml version="1.0" encoding="UTF-8"?>\n${KML_OPEN}\n<name>${escapeXml(title)}</name>\n`,
    rows: (batch) => {
      const features = toFeatures(spec, batch).map((f, i) => ({
        ...f,
        // KML has no null: leave empty values out of ExtendedData; the placemark is named for people.
        properties: {
          name: spec.placemarkName(batch[i]!),
          ...Object.fromEntries(Object.entries(f.properties ?? {}).filter(([, v]) => v !== null && v !== undefined && v !== '')),
        },
      }));
      const kml = toKML({ type: 'FeatureCollection', features });
      if (!kml.startsWith(KML_OPEN) || !kml.endsWith(KML_CLOSE)) throw new Error('Unexpected KML from the writer');
      return kml.slice(KML_OPEN.length, kml.length - KML_CLOSE.length);
    },
    tail: () => `\n${KML_CLOSE}\n`,
  };
}

export function createExportWriter(format: ExportFormat, spec: ExportLayerSpec, title: string): ExportWriter {
  switch (format) {
    case 'csv':
      return csvWriter(spec);
    case 'geojson':
      return geojsonWriter(spec);
    case 'kml':
      return kmlWriter(spec, title);
  }
}
