// Photos of a sighting: checked by their bytes, read for GPS and time, re-encoded into a display
// copy and a thumbnail that carry no metadata at all (no GPS, no device), and stored under keys
// named by the original's SHA-256. Runs outside Vite too (seeds).
import { createHash } from 'node:crypto';
import sharp from 'sharp';
import exifr from 'exifr';
import { IMAGE_EXTENSIONS, sniffImageType } from '../domain/image-type';
import type { PhotoMime } from '../schemas/sightings';
import { AppError } from './errors';
import type { ObjectStorage } from './storage';
import type { NewSightingPhoto } from './repos/sightings';

/** Long edge of the display copy and the thumbnail, in pixels. */
export const DISPLAY_MAX_PX = 1600;
export const THUMB_MAX_PX = 320;
/** Refuse images whose pixel count would need too much memory to decode (a phone camera is 12–50 MP). */
const MAX_INPUT_PIXELS = 80_000_000;

export interface PhotoPosition {
  lat: number;
  lon: number;
}

export interface ProcessedPhoto {
  sha256: string;
  mime: PhotoMime;
  original: Uint8Array;
  width: number;
  height: number;
  gps: PhotoPosition | null;
  takenAt: Date | null;
  display: Uint8Array;
  thumb: Uint8Array;
}

export function sha256Hex(bytes: Uint8Array): string {
  return createHash('sha256').update(bytes).digest('hex');
}

/** The GPS position in a photo's EXIF tags, or null. */
export async function readPhotoGps(bytes: Uint8Array): Promise<PhotoPosition | null> {
  try {
    const gps = await exifr.gps(Buffer.from(bytes));
    if (!gps || !Number.isFinite(gps.latitude) || !Number.isFinite(gps.longitude)) return null;
    if (Math.abs(gps.latitude) > 90 || Math.abs(gps.longitude) > 180) return null;
    return { lat: gps.latitude, lon: gps.longitude };
  } catch {
    return null;
  }
}

async function readTakenAt(bytes: Uint8Array): Promise<Date | null> {
  try {
    const tags = (await exifr.parse(Buffer.from(bytes), { pick: ['DateTimeOriginal'] })) as { DateTimeOriginal?: unknown } | undefined;
    const t = tags?.DateTimeOriginal;
    return t instanceof Date && !Number.isNaN(t.getTime()) ? t : null;
  } catch {
    return null;
  }
}

function resized(bytes: Uint8Array, maxPx: number, quality: number): Promise<Buffer> {
  // rotate() turns the pixels upright by the EXIF orientation; sharp writes no metadata unless
  // asked to (withMetadata), so the copies carry no GPS, time or device tags.
  return sharp(bytes, { limitInputPixels: MAX_INPUT_PIXELS, failOn: 'error' })
    .rotate()
    .resize({ width: maxPx, height: maxPx, fit: 'inside', withoutEnlargement: true })
    .jpeg({ quality, mozjpeg: true })
    .toBuffer();
}

/** Checks and reads one uploaded photo. 415 when the bytes are no JPEG, PNG or WebP; 422 when they do not decode. */
export async function processPhoto(bytes: Uint8Array, label = 'The photo'): Promise<ProcessedPhoto> {
  const mime = sniffImageType(bytes);
  if (!mime) throw new AppError('UNSUPPORTED_MEDIA_TYPE', `${label} is not a JPEG, PNG or WebP image`);
  let width: number;
  let height: number;
  let display: Buffer;
  let thumb: Buffer;
  try {
    const meta = await sharp(bytes, { limitInputPixels: MAX_INPUT_PIXELS }).metadata();
    if (!meta.width || !meta.height) throw new Error('no size');
    const turned = (meta.orientation ?? 1) >= 5;
    width = turned ? meta.height : meta.width;
    height = turned ? meta.width : meta.height;
    [display, thumb] = await Promise.all([resized(bytes, DISPLAY_MAX_PX, 82), resized(bytes, THUMB_MAX_PX, 72)]);
  } catch {
    throw new AppError('UNPROCESSABLE_CONTENT', `${label} could not be read as an image (damaged, or too many pixels)`);
  }
  const [gps, takenAt] = await Promise.all([readPhotoGps(bytes), readTakenAt(bytes)]);
  return { sha256: sha256Hex(bytes), mime, original: bytes, width, height, gps, takenAt, display: new Uint8Array(display), thumb: new Uint8Array(thumb) };
}

export function photoKeys(sha256: string, mime: PhotoMime) {
  return {
    originalKey: `sightings/original/${sha256}.${IMAGE_EXTENSIONS[mime]}`,
    displayKey: `sightings/display/${sha256}.jpg`,
    thumbKey: `sightings/thumb/${sha256}.jpg`,
  };
}

/** Writes the three files (idempotent: the keys are the content's hash) and returns the photo's row. */
export async function storePhoto(storage: ObjectStorage, p: ProcessedPhoto, originalName: string | null): Promise<NewSightingPhoto> {
  const keys = photoKeys(p.sha256, p.mime);
  await storage.put(keys.originalKey, p.original, p.mime);
  await storage.put(keys.displayKey, p.display, 'image/jpeg');
  await storage.put(keys.thumbKey, p.thumb, 'image/jpeg');
  return {
    sha256: p.sha256,
    mime: p.mime,
    byteSize: p.original.byteLength,
    width: p.width,
    height: p.height,
    originalName,
    ...keys,
    gpsLat: p.gps?.lat ?? null,
    gpsLon: p.gps?.lon ?? null,
    takenAt: p.takenAt,
  };
}
