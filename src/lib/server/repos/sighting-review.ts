// The review queue (pending sightings, oldest first, with possible duplicates and how each
// submitter's reports fared) and the reviewer's decision: approve as a new mast, merge into an
// existing mast, or reject with a reason. A decision is made once: the sighting's row is locked
// and a second reviewer deciding at the same moment gets 409 and changes nothing.
import type { Tx } from '../db';
import { DUPLICATE_RADIUS_M, rankDuplicates, splitForMerge, type CellIdentity } from '../../domain/duplicates';
import { CellInputSchema, MAST_PLACE, MastInputSchema, type Mast, type MastPlace } from '../../schemas/masts';
import { STRUCTURE_TYPE_LABELS } from '../../schemas/mast-enums';
import type { DecisionInput, DecisionResult, DuplicateCandidate, ReviewItem, SubmitterRecord } from '../../schemas/review';
import { SIGHTING_STATUS_LABELS, type SightingStatus } from '../../schemas/sightings';
import { ConflictError, NotFoundError, ValidationError } from '../errors';
import { recordAudit } from './audit';
import { recordColumns } from './record-sql';
import { createCell, listCellsForMast, updateCell, type Cell } from './cells';
import { createMast, markMastConfirmed } from './masts';
import { sightingAuditView as auditView } from '../../schemas/sightings';
import { findSighting, listSightings, type Sighting, type SightingCell } from './sightings';

type NearbyMast = MastPlace & { distanceM: number };

/** Masts within the radius of a point, nearest first (PostGIS geography, metres). */
async function listNearbyMasts(db: Tx, lat: number, lon: number, radiusM: number, limit = 20): Promise<NearbyMast[]> {
  // The box in degrees lets the GiST index on masts.geom pick the few masts near the point
  // before the exact geodesic distance is taken.
  const degrees = radiusM / (111_000 * Math.max(Math.cos((lat * Math.PI) / 180), 0.01));
  const point = db.raw('ST_SetSRID(ST_MakePoint(?, ?), 4326)', [lon, lat]);
  const rows = await db('masts as m')
    .select(...recordColumns(db, MAST_PLACE, 'm'), db.raw('ST_Distance(m.geom::geography, ?::geography) AS distance_m', [point]))
    .whereRaw('m.geom && ST_Expand(?, ?)', [point, degrees])
    .whereRaw('ST_DWithin(m.geom::geography, ?::geography, ?)', [point, radiusM])
    .orderBy('distance_m')
    .limit(limit);
  return rows.map((r: Record<string, unknown>) => ({ ...MAST_PLACE.fromRow(r), distanceM: Number(r.distance_m) }));
}

const identity = (c: { operator: { id: string }; tech: string; channel: number; pci: number | null }): CellIdentity => ({
  operatorId: c.operator.id,
  tech: c.tech,
  channel: c.channel,
  pci: c.pci,
});

/** Existing masts the sighting may be a second report of, ranked by shared cells and distance. */
export async function listDuplicateCandidates(db: Tx, sighting: Sighting, radiusM = DUPLICATE_RADIUS_M): Promise<DuplicateCandidate[]> {
  const nearby = await listNearbyMasts(db, sighting.lat, sighting.lon, radiusM);
  const withCells = await Promise.all(
    nearby.map(async (m) => {
      const cells = await listCellsForMast(db, m.id);
      return { mastId: m.id, distanceM: m.distanceM, cells: cells.map((c) => ({ ...identity(c), cell: c })), row: m };
    }),
  );
  const ranked = rankDuplicates(sighting.cells.map(identity), withCells, radiusM);
  return ranked.map((r) => ({
    mast: withCells.find((w) => w.mastId === r.mastId)!.row,
    distanceM: r.distanceM,
    sharedCells: r.sharedCells,
    cells: r.cells.map((c) => c.cell),
  }));
}

/** Sightings per status for each author. */
export async function listSubmitterRecords(db: Tx, authorIds: string[]): Promise<Map<string, SubmitterRecord>> {
  const out = new Map<string, SubmitterRecord>();
  if (authorIds.length === 0) return out;
  const rows = (await db('sightings')
    .whereIn('author_id', [...new Set(authorIds)])
    .groupBy('author_id', 'status')
    .select('author_id', 'status')
    .count('* as n')) as Array<{
    author_id: string;
    status: SightingStatus;
    n: string;
  }>;
  for (const r of rows) {
    const rec = out.get(String(r.author_id)) ?? { approved: 0, merged: 0, rejected: 0, pending: 0 };
    rec[r.status] = Number(r.n);
    out.set(String(r.author_id), rec);
  }
  return out;
}

/** Pending sightings, oldest first, each with its possible duplicates and its submitter's record. */
export async function listReviewQueue(db: Tx, page: { limit: number; offset: number }): Promise<{ items: ReviewItem[]; total: number }> {
  const { items, total } = await listSightings(db, { status: 'pending', oldestFirst: true, limit: page.limit, offset: page.offset });
  const records = await listSubmitterRecords(
    db,
    items.map((s) => s.author.id),
  );
  const out = await Promise.all(
    items.map(async (s) => ({
      sighting: s,
      submitter: records.get(s.author.id) ?? { approved: 0, merged: 0, rejected: 0, pending: 0 },
      candidates: await listDuplicateCandidates(db, s),
    })),
  );
  return { items: out, total };
}

export type { DecisionResult };

function cellInput(c: SightingCell, observedAt: Date) {
  return CellInputSchema.parse({
    operator_id: c.operator.id,
    tech: c.tech,
    band: c.band,
    channel: c.channel,
    pci: c.pci,
    sector_azimuth_deg: c.sectorAzimuthDeg,
    last_observed_at: observedAt,
  });
}

export function defaultMastName(s: Sighting): string {
  return `${STRUCTURE_TYPE_LABELS[s.structureType]} (sighting ${s.id})`;
}

/**
 * Decides a pending sighting, in the caller's transaction. The sighting's row is locked first, so
 * of two reviewers deciding at once the second waits, then finds it decided (409).
 */
export async function decideSighting(trx: Tx, id: string, input: DecisionInput, actorId: string): Promise<DecisionResult> {
  const locked = (await trx('sightings').where({ id }).forUpdate().first('id', 'status')) as { id: string; status: SightingStatus } | undefined;
  if (!locked) throw new NotFoundError('Sighting not found');
  if (locked.status !== 'pending') {
    const current = await findSighting(trx, id);
    const by = current.decidedBy ? ` by ${current.decidedBy.name}` : '';
    throw new ConflictError(`This sighting was already decided${by}: ${SIGHTING_STATUS_LABELS[current.status].toLowerCase()}. Reload the queue.`);
  }
  const before = await findSighting(trx, id);
  let mast: Mast | null = null;
  const addedCells: Cell[] = [];
  let observedCells = 0;

  if (input.decision === 'approve') {
    mast = await createMast(
      trx,
      MastInputSchema.parse({
        name: input.name ?? defaultMastName(before),
        lat: before.lat,
        lon: before.lon,
        structure_height_m: before.estimatedHeightM,
        structure_type: before.structureType,
        status: 'active',
        source: 'sighting',
      }),
      actorId,
    );
    const { added } = splitForMerge(
      before.cells.map((c) => ({ ...identity(c), cell: c })),
      [],
    );
    for (const c of added) addedCells.push(await createCell(trx, mast.id, cellInput(c.cell, before.observedAt), actorId));
  } else if (input.decision === 'merge') {
    const target = await trx('masts').where({ id: input.mastId }).forUpdate().first('id');
    if (!target) throw new ValidationError('Some fields need attention', { mast_id: ['No such mast'] });
    const mastId = String(target.id);
    const existingCells = await listCellsForMast(trx, mastId);
    const { existing, added } = splitForMerge(
      before.cells.map((c) => ({ ...identity(c), cell: c })),
      existingCells.map((c) => ({ ...identity(c), id: c.id, lastObservedAt: c.lastObservedAt })),
    );
    for (const c of added) addedCells.push(await createCell(trx, mastId, cellInput(c.cell, before.observedAt), actorId));
    const seen = new Set(existing.map((e) => e.mastCellId));
    for (const cellId of seen) {
      const cell = existingCells.find((c) => c.id === cellId)!;
      observedCells += 1;
      if (cell.lastObservedAt && cell.lastObservedAt >= before.observedAt) continue;
      await updateCell(trx, cellId, { last_observed_at: before.observedAt }, actorId);
    }
    mast = await markMastConfirmed(trx, mastId, id, actorId);
  }

  const status: SightingStatus = input.decision === 'approve' ? 'approved' : input.decision === 'merge' ? 'merged' : 'rejected';
  const updated = await trx('sightings')
    .where({ id, status: 'pending' })
    .update({ status, decided_by: actorId, decided_at: trx.fn.now(), decision_reason: input.reason, mast_id: mast?.id ?? null });
  if (updated !== 1) throw new ConflictError('This sighting was already decided. Reload the queue.');
  const after = await findSighting(trx, id);
  await recordAudit(trx, { userId: actorId, action: input.decision, entity: 'sighting', entityId: id, before: auditView(before), after: auditView(after) });
  return { sighting: after, mast, addedCells, observedCells };
}
