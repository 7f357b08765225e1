// Elevation data: request schemas (shared by endpoints and the admin page), the field declaration
// of a stored grid, and the JSON the API returns.
import { z } from 'zod';
import { numberParam } from './params';
import { defineRecord, field, type ValueOf } from './record';
import type { ElevationFormat } from '../domain/elevation-formats';
import { getGridSpacingDeg, getGridSpacingM, getGridSpacingMetres, type GridRegistration } from '../domain/elevation-grid';

// Query-string numbers in decimal only: blank is missing, not 0; `0x10` is not 16.
const coordinate = (label: string, limit: number) =>
  numberParam(label).pipe(
    z.number().min(-limit, `${label} must be between −${limit} and ${limit}`).max(limit, `${label} must be between −${limit} and ${limit}`),
  );

export const ElevationSampleQuerySchema = z.object({
  lat: coordinate('Latitude', 90),
  lon: coordinate('Longitude', 180),
});
export type ElevationSampleQuery = z.infer<typeof ElevationSampleQuerySchema>;

export {
  ELEVATION_FORMATS,
  ELEVATION_FORMAT_LABELS,
  MAX_ELEVATION_UPLOAD_BYTES,
  ELEVATION_FILE_ACCEPT,
  type ElevationFormat,
} from '../domain/elevation-formats';

export type SampleType = 'int16' | 'float32';

/**
 * A stored grid's row, field by field (selected with the uploader joined as `u`). The samples live
 * in the file `samples_file`; the repo writes the PostGIS `bounds` from west, south, east, north.
 */
export const ELEVATION_GRID = defineRecord({
  id: field.id(),
  name: field.value<string>({ write: true }),
  format: field.value<ElevationFormat>({ write: true }),
  sha256: field.value<string>({ write: true }),
  byte_size: field.value<number>({ write: true, fromRow: Number }),
  width: field.value<number>({ write: true }),
  height: field.value<number>({ write: true }),
  registration: field.value<GridRegistration>({ write: true }),
  west: field.value<number>({ write: true }),
  south: field.value<number>({ write: true }),
  east: field.value<number>({ write: true }),
  north: field.value<number>({ write: true }),
  nodata: field.value<number | null>({ write: true }),
  sample_type: field.value<SampleType>({ write: true }),
  min_m: field.value<number | null>({ write: true }),
  max_m: field.value<number | null>({ write: true }),
  nodata_count: field.value<number>({ write: true, fromRow: Number }),
  samples_file: field.value<string>({ write: true }),
  samples_sha256: field.value<string>({ write: true }),
  uploaded_by: field.value<{ id: string; name: string } | null>({
    sql: "CASE WHEN {t}.uploaded_by IS NULL THEN NULL ELSE json_build_object('id', {t}.uploaded_by::text, 'name', coalesce(u.name, '')) END",
  }),
  created_at: field.time(),
});

export type ElevationGridRecord = ValueOf<typeof ELEVATION_GRID.fields>;

export interface ElevationGridJson {
  id: string;
  name: string;
  format: ElevationFormat;
  /** [west, south, east, north] in WGS84 degrees (GeoJSON bbox order). */
  bbox: [number, number, number, number];
  width: number;
  height: number;
  registration: 'point' | 'area';
  resolution_arcsec: { lon: number; lat: number };
  /** Finer of the two spacings on the ground, metres. */
  resolution_m: number;
  /** East–west spacing at the latitude nearest the equator, and north–south spacing, metres. */
  resolution_ew_m: number;
  resolution_ns_m: number;
  sample_type: 'int16' | 'float32';
  nodata: number | null;
  nodata_count: number;
  min_m: number | null;
  max_m: number | null;
  byte_size: number;
  sha256: string;
  uploaded_by: { id: string; name: string } | null;
  created_at: string;
}

export interface ElevationSampleJson {
  lat: number;
  lon: number;
  height_m: number | null;
  grid_id: string | null;
}

const round = (n: number, d: number) => Math.round(n * 10 ** d) / 10 ** d;

export function elevationGridJson(r: ElevationGridRecord): ElevationGridJson {
  const spacing = getGridSpacingDeg(r);
  return {
    id: r.id,
    name: r.name,
    format: r.format,
    bbox: [r.west, r.south, r.east, r.north],
    width: r.width,
    height: r.height,
    registration: r.registration,
    resolution_arcsec: { lon: round(spacing.lonDeg * 3600, 4), lat: round(spacing.latDeg * 3600, 4) },
    resolution_m: round(getGridSpacingM(r), 1),
    resolution_ew_m: round(getGridSpacingMetres(r).eastWestM, 1),
    resolution_ns_m: round(getGridSpacingMetres(r).northSouthM, 1),
    sample_type: r.sampleType,
    nodata: r.nodata,
    nodata_count: r.nodataCount,
    min_m: r.minM,
    max_m: r.maxM,
    byte_size: r.byteSize,
    sha256: r.sha256,
    uploaded_by: r.uploadedBy,
    created_at: r.createdAt.toISOString(),
  };
}
