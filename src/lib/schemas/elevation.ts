// Elevation data: request schemas (shared by endpoints and the admin page) and the JSON the API returns.
import { z } from 'zod';
import { numberParam } from './params';
import type { ElevationFormat } from '../domain/elevation-formats';

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
