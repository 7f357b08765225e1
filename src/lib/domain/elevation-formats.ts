// The elevation file formats the admin page accepts, and its upload limit (no schema library here,
// so the page loads little).
export const ELEVATION_FORMATS = ['geotiff', 'hgt'] as const;
export type ElevationFormat = (typeof ELEVATION_FORMATS)[number];
export const ELEVATION_FORMAT_LABELS: Record<ElevationFormat, string> = { geotiff: 'GeoTIFF', hgt: 'SRTM .hgt' };

/** Largest upload accepted, bytes. */
export const MAX_ELEVATION_UPLOAD_BYTES = 100 * 1024 * 1024;
/** File endings the upload form offers (the server also recognises TIFF files by content). */
export const ELEVATION_FILE_ACCEPT = '.tif,.tiff,.hgt';
