// Reading and importing elevation files: GeoTIFF (EPSG:4326, one band) and SRTM .hgt.
// Used by the upload endpoint and by the demo seed, so both go through the same checks.
// Runs outside Vite too (seeds): no astro:env here; callers pass the data folder.
import { fromArrayBuffer, type GeoTIFFImage } from 'geotiff';
import { ElevationDataError, assertValidGrid, getGridStats, parseHgt, type ElevationGrid, type ElevationSamples } from '../domain/elevation-grid';
import { MAX_ELEVATION_UPLOAD_BYTES, type ElevationFormat } from '../schemas/elevation';
import type { Tx } from './db';
import { AppError, ConflictError, ValidationError } from './errors';
import { readMultipartFiles } from './request-body';
import {
  findElevationGridBySha256,
  getSampleType,
  insertElevationGrid,
  removeSamplesFileIfUnused,
  sha256Hex,
  writeSamplesFile,
  type ElevationGridRecord,
} from './repos/elevation';
import { formatCount } from '../domain/format';

export { MAX_ELEVATION_UPLOAD_BYTES };

/**
 * Most samples one grid may have (a 1° tile at 1 arc-second is 13 M; 40 M float32 is 160 MB in
 * memory). Bigger rasters should be cut into tiles before upload.
 */
export const MAX_GRID_SAMPLES = 40_000_000;

export interface ElevationUpload {
  fileName: string;
  bytes: Uint8Array;
}

const tooLarge = () => new AppError('PAYLOAD_TOO_LARGE', `The file is larger than ${MAX_ELEVATION_UPLOAD_BYTES / (1024 * 1024)} MB: cut the area into tiles`);
const unsupported = (message: string) => new AppError('UNSUPPORTED_MEDIA_TYPE', message);
const unprocessable = (message: string) => new AppError('UNPROCESSABLE_CONTENT', message);

/** Reads the `file` field of a multipart upload, refusing oversized bodies while they stream in. */
export async function readElevationUpload(request: Request): Promise<ElevationUpload> {
  const type = request.headers.get('content-type') ?? '';
  if (!type.toLowerCase().startsWith('multipart/form-data')) {
    throw unsupported('Send the file as multipart/form-data in a field named "file"');
  }
  const { files } = await readMultipartFiles(request, { maxFileBytes: MAX_ELEVATION_UPLOAD_BYTES, fileTooLargeMessage: tooLarge().message });
  const file = files.find((f) => f.field === 'file');
  if (!file) throw new ValidationError('Choose a file to upload', { file: ['Choose a file'] });
  if (file.bytes.byteLength === 0) throw new ValidationError('The file is empty', { file: ['The file is empty'] });
  return { fileName: file.fileName, bytes: file.bytes };
}

function isTiff(bytes: Uint8Array): boolean {
  if (bytes.length < 4) return false;
  const [a, b, c, d] = bytes;
  // Classic TIFF (42) and BigTIFF (43), little- and big-endian.
  return (a === 0x49 && b === 0x49 && (c === 42 || c === 43) && d === 0) || (a === 0x4d && b === 0x4d && c === 0 && (d === 42 || d === 43));
}

/** Which reader a file needs: by its content for TIFF, by its name for .hgt; 415 otherwise. */
export function detectElevationFormat(fileName: string, bytes: Uint8Array): ElevationFormat {
  const lower = fileName.toLowerCase();
  if (isTiff(bytes)) return 'geotiff';
  if (lower.endsWith('.hgt')) return 'hgt';
  if (lower.endsWith('.tif') || lower.endsWith('.tiff')) return 'geotiff';
  if (/\.(zip|gz|7z|bz2|xz)$/.test(lower)) {
    throw unsupported('Compressed archives are not read: unpack it and upload the .tif or .hgt inside');
  }
  throw unsupported('Upload elevation data as a GeoTIFF (.tif) or an SRTM .hgt tile');
}

// GeoTIFF key values (GeoTIFF 1.1 specification, OGC 19-008r4).
const MODEL_GEOGRAPHIC = 2;
const RASTER_PIXEL_IS_POINT = 2;
const EPSG_WGS84 = 4326;
const ANGULAR_DEGREE = 9102;
const LINEAR_METRE = 9001;

/** Decodes a GeoTIFF into a grid; ElevationDataError explains anything it cannot use. */
export async function readGeoTiff(bytes: Uint8Array): Promise<ElevationGrid> {
  let image: GeoTIFFImage;
  try {
    const tiff = await fromArrayBuffer(bytes.slice().buffer);
    image = await tiff.getImage(0);
  } catch {
    throw new ElevationDataError('The file is not a readable TIFF');
  }
  const bands = image.getSamplesPerPixel();
  if (bands !== 1) throw new ElevationDataError(`The image has ${bands} bands; upload a single-band elevation raster`);

  const keys = (image.getGeoKeys() ?? {}) as Record<string, number | string | undefined>;
  if (Object.keys(keys).length === 0) {
    throw new ElevationDataError('The TIFF has no georeferencing (GeoTIFF keys); export it as a GeoTIFF in EPSG:4326 (WGS 84 latitude/longitude)');
  }
  if (keys.ProjectedCSTypeGeoKey !== undefined || (keys.GTModelTypeGeoKey !== undefined && keys.GTModelTypeGeoKey !== MODEL_GEOGRAPHIC)) {
    const code = keys.ProjectedCSTypeGeoKey;
    throw new ElevationDataError(
      `The grid is in a projected coordinate system${typeof code === 'number' && code !== 32767 ? ` (EPSG:${code})` : ''}; reproject it to EPSG:4326 (WGS 84 latitude/longitude) first`,
    );
  }
  if (keys.GeographicTypeGeoKey !== EPSG_WGS84) {
    const code = keys.GeographicTypeGeoKey;
    throw new ElevationDataError(
      `The grid uses ${typeof code === 'number' && code !== 32767 ? `EPSG:${code}` : 'an unnamed geographic system'}; only EPSG:4326 (WGS 84) is supported`,
    );
  }
  if (keys.GeogAngularUnitsGeoKey !== undefined && keys.GeogAngularUnitsGeoKey !== ANGULAR_DEGREE) {
    throw new ElevationDataError('The grid coordinates must be in degrees');
  }
  if (keys.VerticalUnitsGeoKey !== undefined && keys.VerticalUnitsGeoKey !== LINEAR_METRE) {
    throw new ElevationDataError('The heights must be in metres');
  }

  const transformation = image.getFileDirectory().getValue('ModelTransformation') as number[] | undefined;
  if (transformation && (transformation[1] !== 0 || transformation[4] !== 0)) {
    throw new ElevationDataError('The grid is rotated or sheared; resample it to a north-up latitude/longitude grid');
  }
  let origin: number[];
  let resolution: number[];
  try {
    origin = image.getOrigin();
    resolution = image.getResolution();
  } catch {
    throw new ElevationDataError('The GeoTIFF does not say where it lies (no tie point and pixel scale)');
  }
  const [x0, y0] = origin as [number, number];
  const [dx, dy] = resolution as [number, number];
  if (!(dx > 0) || !(dy < 0)) {
    throw new ElevationDataError('The grid must be north-up with columns running east (positive pixel scale)');
  }

  const width = image.getWidth();
  const height = image.getHeight();
  if (width * height > MAX_GRID_SAMPLES) {
    throw new ElevationDataError(`The grid has ${width} × ${height} samples; at most ${formatCount(MAX_GRID_SAMPLES)} are accepted: cut it into tiles`);
  }
  const registration = keys.GTRasterTypeGeoKey === RASTER_PIXEL_IS_POINT ? 'point' : 'area';
  const spans = registration === 'point' ? [width - 1, height - 1] : [width, height];

  let raster: ArrayLike<number>;
  try {
    const rasters = await image.readRasters({ samples: [0] });
    raster = (rasters as unknown as ArrayLike<number>[])[0]!;
  } catch (err) {
    const detail = err instanceof Error && err.message ? ` (${err.message})` : '';
    throw new ElevationDataError(`The samples could not be decoded${detail}`);
  }
  const values: ElevationSamples = raster instanceof Int16Array || raster instanceof Float32Array ? raster : Float32Array.from(raster);

  let nodata = image.getGDALNoData();
  if (nodata !== null && !Number.isFinite(nodata)) nodata = null; // NaN voids are always recognised
  if (nodata !== null && values instanceof Float32Array) nodata = Math.fround(nodata);

  return {
    west: x0,
    north: y0,
    east: x0 + dx * spans[0]!,
    south: y0 + dy * spans[1]!,
    width,
    height,
    registration,
    nodata,
    values,
  };
}

/** Size, type and content checks, then decoding: 413, 415 or 422 with the reason. */
export async function decodeElevationFile(upload: ElevationUpload): Promise<{ format: ElevationFormat; grid: ElevationGrid }> {
  if (upload.bytes.byteLength > MAX_ELEVATION_UPLOAD_BYTES) throw tooLarge();
  const format = detectElevationFormat(upload.fileName, upload.bytes);
  try {
    const grid = format === 'hgt' ? parseHgt(upload.fileName, upload.bytes) : await readGeoTiff(upload.bytes);
    assertValidGrid(grid);
    return { format, grid };
  } catch (err) {
    if (err instanceof ElevationDataError) throw unprocessable(`${upload.fileName}: ${err.message}`);
    throw err;
  }
}

export interface ImportOptions {
  /** Folder under which samples are stored (config.dataDir in the app). */
  dataDir: string;
  actorId: string | null;
}

/**
 * Checks, decodes and stores an elevation file: samples file first, then the row and its audit
 * entry in one transaction. A file already imported (same checksum) is refused with 409.
 */
export async function importElevationFile(db: Tx, upload: ElevationUpload, options: ImportOptions): Promise<ElevationGridRecord> {
  const { format, grid } = await decodeElevationFile(upload);
  const sha256 = sha256Hex(upload.bytes);
  const existing = await findElevationGridBySha256(db, sha256);
  if (existing) throw new ConflictError(`This file is already imported as "${existing.name}"`);
  const stats = getGridStats(grid);
  if (stats.minM === null) throw unprocessable(`${upload.fileName}: every sample is a void`);

  const stored = await writeSamplesFile(options.dataDir, grid.values);
  try {
    const { values: _values, id: _id, ...frame } = grid;
    return await db.transaction((trx) =>
      insertElevationGrid(
        trx,
        {
          name: upload.fileName,
          format,
          sha256,
          byteSize: upload.bytes.byteLength,
          grid: frame,
          sampleType: getSampleType(grid.values),
          stats,
          samplesFile: stored.file,
          samplesSha256: stored.sha256,
        },
        options.actorId,
      ),
    );
  } catch (err) {
    await removeSamplesFileIfUnused(db, options.dataDir, stored.file).catch(() => undefined);
    // Two uploads of the same file at once: the unique index answers for the slower one.
    if ((err as { code?: string }).code === '23505') throw new ConflictError('This file is already imported');
    throw err;
  }
}
