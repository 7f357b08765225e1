// The elevation file formats the admin page accepts, and its upload limit (no schema library here,
// so the page loads little).
import { defineChoices, type Choice } from './choices';

export const ELEVATION_FORMAT = defineChoices({ geotiff: 'GeoTIFF', hgt: 'SRTM .hgt' });
export const { values: ELEVATION_FORMATS, labels: ELEVATION_FORMAT_LABELS } = ELEVATION_FORMAT;
export type ElevationFormat = Choice<typeof ELEVATION_FORMAT>;

/** Largest upload accepted, bytes. */
export const MAX_ELEVATION_UPLOAD_BYTES = 100 * 1024 * 1024;
/** File endings the upload form offers (the server also recognises TIFF files by content). */
export const ELEVATION_FILE_ACCEPT = '.tif,.tiff,.hgt';
