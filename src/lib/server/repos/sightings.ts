// Sightings: field reports of a mast with the operators and cells seen and their photos.
// Creating one is idempotent by the client's UUID; reviewers' decisions fill the decided_* columns.
import type { Tx } from '../db';
import type { Bbox } from '../../schemas/mast-query';
import type { OperatorRefJson } from '../../schemas/mast-responses';
import type { Tech } from '../../schemas/mast-enums';
import type {
  MastSurveyJson,
  PendingSightingCollectionJson,
  PhotoMime,
  PositionSource,
  SightingCellJson,
  SightingInput,
  SightingJson,
  SightingPhotoJson,
  SightingStatus,
  SightingStructureType,
  UserRefJson,
} from '../../schemas/sightings';
import { ConflictError, NotFoundError } from '../errors';
import { recordAudit } from './audit';

export interface UserRef {
  id: string;
  name: string;
}

export interface OperatorRef {
  id: string;
  name: string;
  colour: string;
}

export interface SightingCell {
  id: string;
  operator: OperatorRef;
  tech: Tech;
  band: string;
  channel: number;
  dlMhz: number | null;
  pci: number | null;
  sectorAzimuthDeg: number | null;
  rsrpDbm: number | null;
  rsrqDb: number | null;
  sinrDb: number | null;
}

export interface SightingPhoto {
  id: string;
  sightingId: string;
  sha256: string;
  mime: PhotoMime;
  byteSize: number;
  width: number;
  height: number;
  originalName: string | null;
  originalKey: string;
  displayKey: string;
  thumbKey: string;
  gpsLat: number | null;
  gpsLon: number | null;
  takenAt: Date | null;
  createdAt: Date;
}

/** A photo stored before its sighting is written (keys into the photo storage). */
export type NewSightingPhoto = Omit<SightingPhoto, 'id' | 'sightingId' | 'createdAt'>;

export interface Sighting {
  id: string;
  clientUuid: string;
  status: SightingStatus;
  author: UserRef;
  lat: number;
  lon: number;
  positionSource: PositionSource;
  positionAccuracyM: number | null;
  structureType: SightingStructureType;
  estimatedHeightM: number | null;
  operators: OperatorRef[];
  cells: SightingCell[];
  photos: SightingPhoto[];
  notes: string | null;
  observedAt: Date;
  createdAt: Date;
  decidedBy: UserRef | null;
  decidedAt: Date | null;
  decisionReason: string | null;
  mastId: string | null;
}

interface SightingRow {
  id: string;
  client_uuid: string;
  status: SightingStatus;
  author_id: string;
  author_name: string;
  lat: number;
  lon: number;
  position_source: PositionSource;
  position_accuracy_m: number | null;
  structure_type: SightingStructureType;
  estimated_height_m: number | null;
  notes: string | null;
  observed_at: Date;
  created_at: Date;
  decided_by: string | null;
  decider_name: string | null;
  decided_at: Date | null;
  decision_reason: string | null;
  mast_id: string | null;
}

interface PhotoRow {
  id: string;
  sighting_id: string;
  sha256: string;
  mime: PhotoMime;
  byte_size: string;
  width: number;
  height: number;
  original_name: string | null;
  original_key: string;
  display_key: string;
  thumb_key: string;
  gps_lat: number | null;
  gps_lon: number | null;
  taken_at: Date | null;
  created_at: Date;
}

function selectSightings(db: Tx) {
  return db('sightings as s')
    .join('users as a', 'a.id', 's.author_id')
    .leftJoin('users as d', 'd.id', 's.decided_by')
    .select(
      's.id',
      's.client_uuid',
      's.status',
      's.author_id',
      'a.name as author_name',
      db.raw('ST_Y(s.geom::geometry) AS lat'),
      db.raw('ST_X(s.geom::geometry) AS lon'),
      's.position_source',
      's.position_accuracy_m',
      's.structure_type',
      's.estimated_height_m',
      's.notes',
      's.observed_at',
      's.created_at',
      's.decided_by',
      'd.name as decider_name',
      's.decided_at',
      's.decision_reason',
      's.mast_id',
    );
}

function toPhoto(r: PhotoRow): SightingPhoto {
  return {
    id: String(r.id),
    sightingId: String(r.sighting_id),
    sha256: r.sha256,
    mime: r.mime,
    byteSize: Number(r.byte_size),
    width: r.width,
    height: r.height,
    originalName: r.original_name,
    originalKey: r.original_key,
    displayKey: r.display_key,
    thumbKey: r.thumb_key,
    gpsLat: r.gps_lat,
    gpsLon: r.gps_lon,
    takenAt: r.taken_at,
    createdAt: r.created_at,
  };
}

/** Loads operators, cells and photos for the rows in three queries. */
async function withDetails(db: Tx, rows: SightingRow[]): Promise<Sighting[]> {
  if (rows.length === 0) return [];
  const ids = rows.map((r) => r.id);
  const [operatorRows, cellRows, photoRows] = await Promise.all([
    db('sighting_operators as so')
      .join('operators as o', 'o.id', 'so.operator_id')
      .whereIn('so.sighting_id', ids)
      .orderBy('o.id')
      .select('so.sighting_id', 'o.id', 'o.name', 'o.colour') as Promise<Array<{ sighting_id: string; id: string; name: string; colour: string }>>,
    db('sighting_cells as c')
      .join('operators as o', 'o.id', 'c.operator_id')
      .whereIn('c.sighting_id', ids)
      .orderBy('c.id')
      .select('c.*', 'o.name as operator_name', 'o.colour as operator_colour') as Promise<Array<Record<string, unknown>>>,
    db('sighting_photos').whereIn('sighting_id', ids).orderBy('id').select('*') as Promise<PhotoRow[]>,
  ]);
  return rows.map((r) => {
    const id = String(r.id);
    return {
      id,
      clientUuid: r.client_uuid,
      status: r.status,
      author: { id: String(r.author_id), name: r.author_name },
      lat: r.lat,
      lon: r.lon,
      positionSource: r.position_source,
      positionAccuracyM: r.position_accuracy_m,
      structureType: r.structure_type,
      estimatedHeightM: r.estimated_height_m,
      operators: operatorRows.filter((o) => String(o.sighting_id) === id).map((o) => ({ id: String(o.id), name: o.name, colour: o.colour })),
      cells: cellRows
        .filter((c) => String(c.sighting_id) === id)
        .map((c) => ({
          id: String(c.id),
          operator: { id: String(c.operator_id), name: c.operator_name as string, colour: c.operator_colour as string },
          tech: c.tech as Tech,
          band: c.band as string,
          channel: c.channel as number,
          dlMhz: c.dl_mhz as number | null,
          pci: c.pci as number | null,
          sectorAzimuthDeg: c.sector_azimuth_deg as number | null,
          rsrpDbm: c.rsrp_dbm as number | null,
          rsrqDb: c.rsrq_db as number | null,
          sinrDb: c.sinr_db as number | null,
        })),
      photos: photoRows.filter((p) => String(p.sighting_id) === id).map(toPhoto),
      notes: r.notes,
      observedAt: r.observed_at,
      createdAt: r.created_at,
      decidedBy: r.decided_by === null ? null : { id: String(r.decided_by), name: r.decider_name ?? '' },
      decidedAt: r.decided_at,
      decisionReason: r.decision_reason,
      mastId: r.mast_id === null ? null : String(r.mast_id),
    };
  });
}

export async function findSighting(db: Tx, id: string): Promise<Sighting> {
  const row = (await selectSightings(db).where('s.id', id).first()) as SightingRow | undefined;
  if (!row) throw new NotFoundError('Sighting not found');
  const [sighting] = await withDetails(db, [row]);
  return sighting!;
}

export async function findSightingByClientUuid(db: Tx, clientUuid: string): Promise<Sighting | null> {
  const row = (await selectSightings(db).where('s.client_uuid', clientUuid.toLowerCase()).first()) as SightingRow | undefined;
  if (!row) return null;
  const [sighting] = await withDetails(db, [row]);
  return sighting!;
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
    .offset(options.offset)) as SightingRow[];
  const [{ count }] = (await filter(db('sightings as s')).count<{ count: string }[]>('* as count')) as [{ count: string }];
  return { items: await withDetails(db, rows), total: Number(count) };
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
      client_uuid: input.clientUuid,
      author_id: authorId,
      status: 'pending',
      geom: db.raw('ST_SetSRID(ST_MakePoint(?, ?), 4326)::geography', [input.lon, input.lat]),
      position_source: input.positionSource,
      position_accuracy_m: input.positionAccuracyM,
      structure_type: input.structureType,
      estimated_height_m: input.estimatedHeightM,
      notes: input.notes,
      observed_at: input.observedAt,
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
      input.cells.map((c) => ({
        sighting_id: id,
        operator_id: c.operatorId,
        tech: c.tech,
        band: c.band,
        channel: c.channel,
        dl_mhz: Number.isFinite(c.dlMhz) ? c.dlMhz : null,
        pci: c.pci,
        sector_azimuth_deg: c.sectorAzimuthDeg,
        rsrp_dbm: c.rsrpDbm,
        rsrq_db: c.rsrqDb,
        sinr_db: c.sinrDb,
      })),
    );
  }
  const uniquePhotos = [...new Map(photos.map((p) => [p.sha256, p])).values()];
  if (uniquePhotos.length) {
    await db('sighting_photos').insert(
      uniquePhotos.map((p) => ({
        sighting_id: id,
        sha256: p.sha256,
        mime: p.mime,
        byte_size: p.byteSize,
        width: p.width,
        height: p.height,
        original_name: p.originalName,
        original_key: p.originalKey,
        display_key: p.displayKey,
        thumb_key: p.thumbKey,
        gps_lat: p.gpsLat,
        gps_lon: p.gpsLon,
        taken_at: p.takenAt,
      })),
    );
  }
  const sighting = await findSighting(db, id);
  await recordAudit(db, { userId: authorId, action: 'create', entity: 'sighting', entityId: id, after: auditView(sighting) });
  return { sighting, created: true };
}

export async function findSightingPhoto(db: Tx, photoId: string): Promise<SightingPhoto & { sightingStatus: SightingStatus; authorId: string }> {
  const row = (await db('sighting_photos as p')
    .join('sightings as s', 's.id', 'p.sighting_id')
    .where('p.id', photoId)
    .first('p.*', 's.status as sighting_status', 's.author_id')) as (PhotoRow & { sighting_status: SightingStatus; author_id: string }) | undefined;
  if (!row) throw new NotFoundError('Photo not found');
  return { ...toPhoto(row), sightingStatus: row.sighting_status, authorId: String(row.author_id) };
}

/** Who may see a pending sighting: reviewers and admins see all, everyone else their own. */
export interface PendingViewer {
  userId: string;
  seesAll: boolean;
}

export async function listPendingSightingFeatures(db: Tx, viewer: PendingViewer, bbox?: Bbox, limit = 2000): Promise<PendingSightingCollectionJson> {
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
  return {
    type: 'FeatureCollection',
    features: rows.map((r) => ({
      type: 'Feature',
      id: Number(r.id),
      geometry: { type: 'Point', coordinates: [r.lon, r.lat] },
      properties: {
        id: String(r.id),
        structure_type: r.structure_type,
        author_name: r.author_name,
        observed_at: r.observed_at.toISOString(),
        mine: String(r.author_id) === viewer.userId,
      },
    })),
  };
}

export interface MastSurveys {
  surveyors: Array<UserRef & { lastObservedAt: Date }>;
  lastObservedAt: Date | null;
  photos: SightingPhoto[];
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
    .select('p.*')) as PhotoRow[];
  const surveyors = people.map((p) => ({ id: String(p.id), name: p.name, lastObservedAt: p.last_observed_at }));
  return { surveyors, lastObservedAt: surveyors[0]?.lastObservedAt ?? null, photos: photos.map(toPhoto) };
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

// --- JSON ------------------------------------------------------------------------------------------

export const PHOTO_URL_PREFIX = '/api/sightings/photos';

export function photoJson(p: SightingPhoto, withOriginal: boolean): SightingPhotoJson {
  return {
    id: p.id,
    sha256: p.sha256,
    mime: p.mime,
    byte_size: p.byteSize,
    width: p.width,
    height: p.height,
    taken_at: p.takenAt ? p.takenAt.toISOString() : null,
    display_url: `${PHOTO_URL_PREFIX}/${p.id}/display`,
    thumb_url: `${PHOTO_URL_PREFIX}/${p.id}/thumb`,
    original_url: withOriginal ? `${PHOTO_URL_PREFIX}/${p.id}/original` : null,
  };
}

function userRefJson(u: UserRef): UserRefJson {
  return { id: u.id, name: u.name };
}

function operatorRefJson(o: OperatorRef): OperatorRefJson {
  return { id: o.id, name: o.name, colour: o.colour };
}

function cellJson(c: SightingCell): SightingCellJson {
  return {
    id: c.id,
    operator: operatorRefJson(c.operator),
    tech: c.tech,
    band: c.band,
    channel: c.channel,
    dl_mhz: c.dlMhz,
    pci: c.pci,
    sector_azimuth_deg: c.sectorAzimuthDeg,
    rsrp_dbm: c.rsrpDbm,
    rsrq_db: c.rsrqDb,
    sinr_db: c.sinrDb,
  };
}

/** `withOriginals`: link the photos as uploaded (reviewers and admins only). */
export function sightingJson(s: Sighting, options: { withOriginals: boolean }): SightingJson {
  return {
    id: s.id,
    client_uuid: s.clientUuid,
    status: s.status,
    author: userRefJson(s.author),
    lat: s.lat,
    lon: s.lon,
    position_source: s.positionSource,
    position_accuracy_m: s.positionAccuracyM,
    structure_type: s.structureType,
    estimated_height_m: s.estimatedHeightM,
    operators: s.operators.map(operatorRefJson),
    cells: s.cells.map(cellJson),
    photos: s.photos.map((p) => photoJson(p, options.withOriginals)),
    notes: s.notes,
    observed_at: s.observedAt.toISOString(),
    created_at: s.createdAt.toISOString(),
    decided_by: s.decidedBy ? userRefJson(s.decidedBy) : null,
    decided_at: s.decidedAt ? s.decidedAt.toISOString() : null,
    decision_reason: s.decisionReason,
    mast_id: s.mastId,
  };
}

export function mastSurveyJson(m: MastSurveys, options: { withOriginals: boolean }): MastSurveyJson {
  return {
    surveyors: m.surveyors.map((u) => ({ id: u.id, name: u.name, last_observed_at: u.lastObservedAt.toISOString() })),
    last_observed_at: m.lastObservedAt ? m.lastObservedAt.toISOString() : null,
    photos: m.photos.map((p) => ({ ...photoJson(p, options.withOriginals), sighting_id: p.sightingId })),
  };
}

export function auditView(s: Sighting) {
  return {
    client_uuid: s.clientUuid,
    status: s.status,
    lat: s.lat,
    lon: s.lon,
    position_source: s.positionSource,
    structure_type: s.structureType,
    estimated_height_m: s.estimatedHeightM,
    operator_ids: s.operators.map((o) => o.id),
    cells: s.cells.map((c) => ({ operator_id: c.operator.id, tech: c.tech, band: c.band, channel: c.channel, pci: c.pci })),
    photos: s.photos.map((p) => p.sha256),
    notes: s.notes,
    observed_at: s.observedAt.toISOString(),
    decided_by: s.decidedBy?.id ?? null,
    decided_at: s.decidedAt?.toISOString() ?? null,
    decision_reason: s.decisionReason,
    mast_id: s.mastId,
  };
}
