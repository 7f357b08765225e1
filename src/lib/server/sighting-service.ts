// Submitting a sighting: the multipart body (a JSON part "sighting" and up to six "photo" parts)
// is checked, the photos re-encoded and stored, and the sighting written in one transaction. A
// retry with the same client UUID answers with the first sighting and stores nothing new.
import type { Knex } from 'knex';
import { getDistanceM } from '../domain/geodesy';
import { MAX_PHOTO_BYTES, MAX_SIGHTING_PHOTOS, SightingInputSchema } from '../schemas/sightings';
import { ConflictError, ValidationError } from './errors';
import { parseWith } from './http';
import type { BufferedFile, MultipartLimits } from './request-body';
import { processPhoto, storePhoto, type ProcessedPhoto } from './photos';
import { createSighting, findSightingByClientUuid, type NewSightingPhoto, type Sighting } from './repos/sightings';
import type { ObjectStorage } from './storage';

export const SIGHTING_UPLOAD_LIMITS: MultipartLimits = {
  maxFiles: MAX_SIGHTING_PHOTOS,
  maxFileBytes: MAX_PHOTO_BYTES,
  maxFields: 4,
  maxFieldBytes: 64 * 1024,
  maxTotalBytes: MAX_SIGHTING_PHOTOS * MAX_PHOTO_BYTES + 256 * 1024,
  fileTooLargeMessage: `Each photo may be at most ${MAX_PHOTO_BYTES / (1024 * 1024)} MB`,
};

export interface SightingUpload {
  fields: Record<string, string>;
  files: BufferedFile[];
}

/**
 * How far the position may be from a photo's GPS tags and still count as "from the photo": phone
 * GPS is good to a few metres in the open, rounding in EXIF adds a little (common practice).
 */
export const PHOTO_POSITION_TOLERANCE_M = 50;

function readSightingPart(body: SightingUpload): unknown {
  const text = body.fields.sighting;
  if (text === undefined) throw new ValidationError('The form has no "sighting" part', { sighting: ['Required'] });
  try {
    return JSON.parse(text);
  } catch {
    throw new ValidationError('The "sighting" part is not JSON', { sighting: ['Not JSON'] });
  }
}

function checkPhotoPosition(input: { lat: number; lon: number }, photos: ProcessedPhoto[]): void {
  const tagged = photos.filter((p) => p.gps !== null);
  if (tagged.length === 0) {
    throw new ValidationError('None of the photos carries a GPS position', {
      position_source: ['None of the photos carries a GPS position: use the device location or the map'],
    });
  }
  const nearest = Math.min(...tagged.map((p) => getDistanceM(input, p.gps!)));
  if (nearest > PHOTO_POSITION_TOLERANCE_M) {
    throw new ValidationError('The position is not where the photo was taken', {
      lat: [`${Math.round(nearest)} m from the photo's GPS position; if you moved the marker, the position is from the map`],
    });
  }
}

export async function submitSighting(
  db: Knex,
  storage: ObjectStorage,
  authorId: string,
  body: SightingUpload,
): Promise<{ sighting: Sighting; created: boolean }> {
  const input = parseWith(SightingInputSchema, readSightingPart(body));
  const files = body.files.filter((f) => f.field === 'photo');
  if (files.length !== body.files.length) throw new ValidationError('Photos go in parts named "photo"', { photos: ['Unexpected file part'] });

  const first = await findSightingByClientUuid(db, input.clientUuid);
  if (first) {
    if (first.author.id !== authorId) throw new ConflictError('This sighting id was already used by someone else');
    return { sighting: first, created: false };
  }

  const processed: ProcessedPhoto[] = [];
  for (const [i, f] of files.entries()) {
    if (f.bytes.byteLength === 0) throw new ValidationError(`Photo ${i + 1} is empty`, { photos: [`Photo ${i + 1} is empty`] });
    processed.push(await processPhoto(f.bytes, `Photo ${i + 1}${f.fileName !== 'upload' ? ` (${f.fileName})` : ''}`));
  }
  if (input.positionSource === 'photo') checkPhotoPosition(input, processed);

  const stored: NewSightingPhoto[] = [];
  for (const [i, p] of processed.entries()) stored.push(await storePhoto(storage, p, files[i]!.fileName));
  return db.transaction((trx) => createSighting(trx, input, authorId, stored));
}
