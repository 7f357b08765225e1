// Sightings: field reports of a mast with the operators and cells seen and their photos.
// Creating one is idempotent by the client's UUID; reviewers' decisions fill the decided_* columns.
import type { Tx } from '../db';
import type { Bbox } from '../../schemas/mast-query';
import {
  SIGHTING,
  SIGHTING_CELL,
  SIGHTING_PHOTO,
  type MastSurveys,
  type NewSightingPhoto,
  type PendingSighting,
  type Sighting,
  type SightingCell,
  type SightingInput,
  type SightingPhoto,
  type SightingStatus,
  type SightingStructureType,
} from '../../schemas/sightings';
import { ConflictError, NotFoundError } from '../errors';
import { recordAudit } from './audit';
import { recordColumns } from './record-sql';
import { sightingAuditView as auditView } from '../../schemas/sightings';

export type { MastSurveys, NewSightingPhoto, Sighting, SightingCell, SightingPhoto };

function selectSightings(db: Tx) {
  return db('sightings as s')
    .join('users as a', 'a.id', 's.author_id')
    .leftJoin('users as d', 'd.id', 's.decided_by')
    .select(recordColumns(db, SIGHTING, 's'));
}

const toSighting = (row: Record<string, unknown>): Sighting => SIGHTING.fromRow(row);

export async function findSighting(db: Tx, id: string): Promise<Sighting> {
  const row = await selectSightings(db).where('s.id', id).first();
  if (!row) throw new NotFoundError('Sighting not found');
  return toSighting(row);
}

export async function findSightingByClientUuid(db: Tx, clientUuid: string): Promise<Sighting | null> {
  const row = await selectSightings(db).where('s.client_uuid', clientUuid.toLowerCase()).first();
  return row ? toSighting(row) : null;
}

export interface SightingListOptions {
  authorId?: string;
  status?: SightingStatus;
  /** Oldest first (the review queue); newest first otherwise. */
  oldestFirst?: boolean;
  limit: number;
  offset: number;
}

export async function listSightings(db: Tx, options: SightingListOptions): Promise<{ items: Sighting[]; total: number }> {
  const filter = (q: ReturnType<typeof db>) => {
    if (options.authorId) q.where('s.author_id', options.authorId);
    if (options.status) q.where('s.status', options.status);
    return q;
  };
  const direction = options.oldestFirst ? 'asc' : 'desc';
  const rows = (await filter(selectSightings(db))
    .orderBy('s.created_at', direction)
    .orderBy('s.id', direction)
    .limit(options.limit)
    .offset(options.offset)) as Record<string, unknown>[];
  const [{ count }] = (await filter(db('sightings as s')).count<{ count: string }[]>('* as count')) as [{ count: string }];
  return { items: rows.map(toSighting), total: Number(count) };
}

/**
 * Creates the sighting with its operators, cells and already stored photos, or, when the client's
 * UUID was used before by the same author, returns the first one (`created: false`) and writes
 * nothing. Run it in a transaction.
 */
export async function createSighting(
  db: Tx,
  input: SightingInput,
  authorId: string,
  photos: NewSightingPhoto[],
): Promise<{ sighting: Sighting; created: boolean }> {
  const inserted: Array<{ id: string }> = await db('sightings')
    .insert({
      ...SIGHTING.insertRow(input),
      author_id: authorId,
      status: 'pending',
      geom: db.raw('ST_SetSRID(ST_MakePoint(?, ?), 4326)::geography', [input.lon, input.lat]),
    })
    .onConflict('client_uuid')
    .ignore()
    .returning('id');
  if (inserted.length === 0) {
    const first = await findSightingByClientUuid(db, input.clientUuid);
    if (!first || first.author.id !== authorId) throw new ConflictError('This sighting id was already used by someone else');
    return { sighting: first, created: false };
  }
  const id = String(inserted[0]!.id);
  if (input.operatorIds.length) {
    await db('sighting_operators').insert(input.operatorIds.map((operatorId) => ({ sighting_id: id, operator_id: operatorId })));
  }
  if (input.cells.length) {
    await db('sighting_cells').insert(
      input.cells.map((c) => ({ ...SIGHTING_CELL.insertRow(c), sighting_id: id, dl_mhz: Number.isFinite(c.dlMhz) ? c.dlMhz : null })),
    );
  }
  const uniquePhotos = [...new Map(photos.map((p) => [p.sha256, p])).values()];
  if (uniquePhotos.length) {
    await db('sighting_photos').insert(uniquePhotos.map((p) => ({ ...SIGHTING_PHOTO.insertRow(p), sighting_id: id })));
  }
  const sighting = await findSighting(db, id);
  await recordAudit(db, { userId: authorId, action: 'create', entity: 'sighting', entityId: id, after: auditView(sighting) });
  return { sighting, created: true };
}

export async function findSightingPhoto(db: Tx, photoId: string): Promise<SightingPhoto & { sightingStatus: SightingStatus; authorId: string }> {
  const row = await db('sighting_photos as p')
    .join('sightings as s', 's.id', 'p.sighting_id')
    .where('p.id', photoId)
    .first([...recordColumns(db, SIGHTING_PHOTO, 'p'), 's.status as sighting_status', 's.author_id']);
  if (!row) throw new NotFoundError('Photo not found');
  return { ...SIGHTING_PHOTO.fromRow(row), sightingStatus: row.sighting_status, authorId: String(row.author_id) };
}

/** Who may see a pending sighting: reviewers and admins see all, everyone else their own. */
export interface PendingViewer {
  userId: string;
  seesAll: boolean;
}

export async function listPendingSightings(db: Tx, viewer: PendingViewer, bbox?: Bbox, limit = 2000): Promise<PendingSighting[]> {
  const q = db('sightings as s')
    .join('users as a', 'a.id', 's.author_id')
    .where('s.status', 'pending')
    .select(
      's.id',
      's.structure_type',
      's.author_id',
      's.observed_at',
      'a.name as author_name',
      db.raw('ST_Y(s.geom::geometry) AS lat'),
      db.raw('ST_X(s.geom::geometry) AS lon'),
    )
    .orderBy('s.id')
    .limit(limit);
  if (!viewer.seesAll) q.where('s.author_id', viewer.userId);
  if (bbox) q.whereRaw('s.geom::geometry && ST_MakeEnvelope(?, ?, ?, ?, 4326)', [bbox.minLon, bbox.minLat, bbox.maxLon, bbox.maxLat]);
  const rows = (await q) as Array<{
    id: string;
    structure_type: SightingStructureType;
    author_id: string;
    observed_at: Date;
    author_name: string;
    lat: number;
    lon: number;
  }>;
  return rows.map((r) => ({
    id: String(r.id),
    structureType: r.structure_type,
    authorId: String(r.author_id),
    authorName: r.author_name,
    observedAt: r.observed_at,
    lat: r.lat,
    lon: r.lon,
  }));
}

/** The approved or merged sightings of a mast: their photos, their authors and when they were last there. */
export async function listMastSurveys(db: Tx, mastId: string): Promise<MastSurveys> {
  const people = (await db('sightings as s')
    .join('users as u', 'u.id', 's.author_id')
    .where('s.mast_id', mastId)
    .whereIn('s.status', ['approved', 'merged'])
    .groupBy('u.id', 'u.name')
    .orderByRaw('max(s.observed_at) DESC')
    .select('u.id', 'u.name', db.raw('max(s.observed_at) AS last_observed_at'))) as Array<{ id: string; name: string; last_observed_at: Date }>;
  const photos = (await db('sighting_photos as p')
    .join('sightings as s', 's.id', 'p.sighting_id')
    .where('s.mast_id', mastId)
    .whereIn('s.status', ['approved', 'merged'])
    .orderBy('s.observed_at', 'desc')
    .orderBy('p.id')
    .limit(24)
    .select(recordColumns(db, SIGHTING_PHOTO, 'p'))) as Record<string, unknown>[];
  const surveyors = people.map((p) => ({ id: String(p.id), name: p.name, lastObservedAt: p.last_observed_at }));
  return { surveyors, lastObservedAt: surveyors[0]?.lastObservedAt ?? null, photos: photos.map((p) => SIGHTING_PHOTO.fromRow(p)) };
}

/** Where a new sighting's map opens: the author's last sighting, else the middle of the masts, else 0, 0. */
export async function findSurveyStartPoint(db: Tx, authorId: string): Promise<{ lat: number; lon: number }> {
  const last = (await db('sightings')
    .where({ author_id: authorId })
    .orderBy('created_at', 'desc')
    .first(db.raw('ST_Y(geom::geometry) AS lat'), db.raw('ST_X(geom::geometry) AS lon'))) as { lat: number; lon: number } | undefined;
  if (last) return last;
  const centre = (await db('masts').first(db.raw('ST_Y(ST_Centroid(ST_Collect(geom))) AS lat'), db.raw('ST_X(ST_Centroid(ST_Collect(geom))) AS lon'))) as
    { lat: number | null; lon: number | null } | undefined;
  return centre?.lat != null && centre.lon != null ? { lat: centre.lat, lon: centre.lon } : { lat: 0, lon: 0 };
}
