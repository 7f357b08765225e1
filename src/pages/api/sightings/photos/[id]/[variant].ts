import { getDb } from '../../../../../lib/server/db';
import { getStorage } from '../../../../../lib/server/files';
import { handler, parseWith, requirePermission, requireUser } from '../../../../../lib/server/http';
import { NotFoundError } from '../../../../../lib/server/errors';
import { findSightingPhoto } from '../../../../../lib/server/repos/sightings';
import { PhotoParamsSchema } from '../../../../../lib/schemas/sightings';
import { can } from '../../../../../lib/domain/roles';

/**
 * A photo's display copy or thumbnail (no metadata): to its author, reviewers and admins, and to
 * every role that views the map once the sighting became part of a mast. The original as uploaded
 * (with its GPS and device tags) only to reviewers and admins.
 */
export const GET = handler(async ({ locals, params }) => {
  const { id, variant } = parseWith(PhotoParamsSchema, params);
  const user = variant === 'original' ? requirePermission(locals, 'sightings:review') : requireUser(locals);
  const photo = await findSightingPhoto(getDb(), id);
  const onMap = (photo.sightingStatus === 'approved' || photo.sightingStatus === 'merged') && can(user.role, 'map:view');
  if (!(can(user.role, 'sightings:review') || photo.authorId === user.id || onMap)) throw new NotFoundError('Photo not found');
  const key = variant === 'original' ? photo.originalKey : variant === 'display' ? photo.displayKey : photo.thumbKey;
  const file = await getStorage().get(key);
  if (!file) throw new NotFoundError('The photo file is missing from the storage');
  const headers: Record<string, string> = {
    'Content-Type': file.contentType,
    'Content-Length': String(file.bytes.byteLength),
    // The keys are content hashes: a URL's bytes never change, but who may see them can.
    'Cache-Control': 'private, max-age=86400',
    'X-Content-Type-Options': 'nosniff',
  };
  if (variant === 'original') headers['Content-Disposition'] = `inline; filename="sighting-photo-${photo.id}.${photo.originalKey.split('.').pop()}"`;
  return new Response(Buffer.from(file.bytes), { status: 200, headers });
});
