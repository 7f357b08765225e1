// Masts: map listing with filters, detail with cells and recent readings, and audited writes
// with optimistic concurrency (row_version).
import type { Knex } from 'knex';
import type { Tx } from '../db';
import type { MastFilter, Bbox } from '../../schemas/mast-query';
import type { Tech } from '../../schemas/mast-enums';
import { MAST, MAST_PLACE, type Mast, type MastChange, type MastInput, type OperatorRef } from '../../schemas/masts';
import type { MastDetail, MastSummary } from '../../schemas/mast-responses';
import { ConflictError, NotFoundError } from '../errors';
import { recordAudit } from './audit';
import { cellAuditView, listCellsForMast } from './cells';
import { assertNoPlansUseCells, unlinkReadingsOfCells } from './cell-dependents';
import { listRecentReadingsForMast } from './readings';
import { recordColumns } from './record-sql';

// --- Shared SQL for the list and the tiles -----------------------------------------------------

/** Adds the filters to a query over `masts m`: OR within a list, AND across lists; cell filters need one cell matching all. */
export function applyMastFilter(db: Tx, q: Knex.QueryBuilder, filter: MastFilter): Knex.QueryBuilder {
  if (filter.statuses?.length) q.whereIn('m.status', filter.statuses);
  const { operatorIds, techs, bands } = filter;
  if (operatorIds?.length || techs?.length || bands?.length) {
    q.whereExists(function () {
      this.select(db.raw('1')).from('cells as fc').whereRaw('fc.mast_id = m.id');
      if (operatorIds?.length) this.whereIn('fc.operator_id', operatorIds);
      if (techs?.length) this.whereIn('fc.tech', techs);
      if (bands?.length)
        this.whereIn(
          ['fc.tech', 'fc.band'],
          bands.map((b) => [b.tech, b.band]),
        );
    });
  }
  return q;
}

async function loadOperatorRefs(db: Tx): Promise<Map<string, OperatorRef>> {
  const rows: Array<{ id: string; name: string; colour: string }> = await db('operators').select('id', 'name', 'colour');
  return new Map(rows.map((r) => [String(r.id), { id: String(r.id), name: r.name, colour: r.colour }]));
}

export interface MastListOptions extends MastFilter {
  bbox?: Bbox;
  limit: number;
}

export async function listMasts(db: Tx, options: MastListOptions): Promise<{ items: MastSummary[]; truncated: boolean }> {
  const q = db('masts as m')
    .select(
      ...recordColumns(db, MAST_PLACE, 'm'),
      db.raw('coalesce(s.cell_count, 0) AS cell_count'),
      db.raw("coalesce(s.op_ids, '{}') AS op_ids"),
      db.raw("coalesce(s.bands, '{}') AS bands"),
      db.raw("coalesce(s.techs, '{}') AS techs"),
    )
    .leftJoin('mast_cell_summaries as s', 's.mast_id', 'm.id')
    .limit(options.limit + 1);
  if (options.bbox) {
    // A box holding more masts than the limit gives the ones nearest its centre, so a wide view
    // shows the masts around where the user looks, not the oldest ids anywhere. They are picked by
    // a nearest-first walk of the spatial index (an ORDER BY of the distance alone); only those few
    // are then sorted with the id as tie-break, never every mast in the box.
    const b = options.bbox;
    const centre = [(b.minLon + b.maxLon) / 2, (b.minLat + b.maxLat) / 2];
    const nearest = db('masts as m')
      .select('m.id')
      .whereRaw('m.geom && ST_MakeEnvelope(?, ?, ?, ?, 4326)', [b.minLon, b.minLat, b.maxLon, b.maxLat])
      .orderByRaw('m.geom <-> ST_SetSRID(ST_MakePoint(?, ?), 4326)', centre)
      .limit(options.limit + 1);
    applyMastFilter(db, nearest, options);
    q.whereIn('m.id', nearest).orderByRaw('m.geom <-> ST_SetSRID(ST_MakePoint(?, ?), 4326)', centre);
  } else {
    applyMastFilter(db, q, options);
  }
  q.orderBy('m.id');
  const [rows, operators] = await Promise.all([q, loadOperatorRefs(db)]);
  const items = (rows as Array<Record<string, unknown>>).slice(0, options.limit).map((r): MastSummary => ({
    ...MAST_PLACE.fromRow(r),
    operators: (r.op_ids as string[]).map((id) => operators.get(String(id))).filter((o): o is OperatorRef => o !== undefined),
    bands: r.bands as string[],
    techs: r.techs as Tech[],
    cellCount: Number(r.cell_count),
  }));
  return { items, truncated: rows.length > options.limit };
}

async function findMastRow(db: Tx, id: string, forUpdate = false): Promise<Mast> {
  const q = db('masts as m')
    .select(recordColumns(db, MAST, 'm'))
    .where('m.id', id)
    .first();
  if (forUpdate) q.forUpdate();
  const row = (await q) as Record<string, unknown> | undefined;
  if (!row) throw new NotFoundError('Mast not found');
  return MAST.fromRow(row);
}

/**
 * The mast with its cells and recent readings. Readings fed back from install checks were taken at
 * customers' homes, so they are left out unless the caller may see customers (`withInstallReadings`).
 */
export async function findMast(db: Tx, id: string, options: { withInstallReadings?: boolean } = {}): Promise<MastDetail> {
  const mast = await findMastRow(db, id);
  const cells = await listCellsForMast(db, id);
  const recentReadings = await listRecentReadingsForMast(db, id, 20, options.withInstallReadings ?? false);
  const operators = new Map<string, OperatorRef>();
  for (const c of cells) operators.set(c.operator.id, c.operator);
  return { ...mast, operators: [...operators.values()].sort((a, b) => Number(a.id) - Number(b.id)), cells, recentReadings };
}

export interface MastSearchHit {
  id: string;
  name: string;
  reference: string | null;
  lat: number;
  lon: number;
}

/** Escapes LIKE wildcards so user text matches literally. */
export function escapeLike(text: string): string {
  return text.replace(/[\\%_]/g, (c) => `\\${c}`);
}

/** Masts whose name or reference contains the text or resembles it (trigram similarity), best first. */
export async function searchMasts(db: Tx, text: string, limit: number): Promise<MastSearchHit[]> {
  const contains = `%${escapeLike(text)}%`;
  const prefix = `${escapeLike(text)}%`;
  const rows: Array<{ id: string; name: string; reference: string | null; lat: number; lon: number }> = await db('masts')
    .select('id', 'name', 'reference', db.raw('ST_Y(geom) AS lat'), db.raw('ST_X(geom) AS lon'))
    .where((w) => w.whereILike('name', contains).orWhereILike('reference', contains).orWhereRaw('name % ?', [text]))
    .orderByRaw('(name ILIKE ? OR reference ILIKE ?) DESC', [prefix, prefix])
    .orderByRaw('greatest(similarity(name, ?), coalesce(similarity(reference, ?), 0)) DESC', [text, text])
    .orderBy('name')
    .limit(limit);
  return rows.map((r) => ({ id: String(r.id), name: r.name, reference: r.reference, lat: r.lat, lon: r.lon }));
}

async function assertReferenceFree(db: Tx, reference: string | null, exceptId?: string): Promise<void> {
  if (!reference) return;
  const q = db('masts').whereRaw('lower(reference) = lower(?)', [reference]);
  if (exceptId) q.whereNot('id', exceptId);
  const other = await q.first('id');
  if (other) throw new ConflictError(`Mast ${other.id} already has the reference ${reference}`);
}

function pointSql(db: Tx, lat: number, lon: number) {
  return db.raw('ST_SetSRID(ST_MakePoint(?, ?), 4326)', [lon, lat]);
}

export async function createMast(db: Tx, input: MastInput, actorId: string | null): Promise<Mast> {
  await assertReferenceFree(db, input.reference);
  const [row] = await db('masts')
    .insert({ ...MAST.insertRow(input), geom: pointSql(db, input.lat, input.lon), created_by: actorId, updated_by: actorId })
    .returning('id');
  const mast = await findMastRow(db, String(row.id));
  await recordAudit(db, { userId: actorId, action: 'create', entity: 'mast', entityId: mast.id, after: auditView(mast) });
  return mast;
}

function staleVersion(current: number): ConflictError {
  return new ConflictError(`Someone else changed this mast meanwhile (now version ${current}). Reload it and apply your change again.`);
}

export async function updateMast(db: Tx, id: string, change: MastChange, actorId: string): Promise<Mast> {
  const before = await findMastRow(db, id, true);
  if (before.rowVersion !== change.rowVersion) throw staleVersion(before.rowVersion);
  if (change.reference !== undefined) await assertReferenceFree(db, change.reference, id);
  const patch: Record<string, unknown> = {
    ...MAST.patchRow(change),
    row_version: db.raw('row_version + 1'),
    updated_at: db.fn.now(),
    updated_by: actorId,
  };
  if (change.lat !== undefined && change.lon !== undefined) patch.geom = pointSql(db, change.lat, change.lon);
  const updated = await db('masts').where({ id, row_version: change.rowVersion }).update(patch);
  if (updated === 0) throw staleVersion((await findMastRow(db, id)).rowVersion);
  const after = await findMastRow(db, id);
  await recordAudit(db, { userId: actorId, action: 'update', entity: 'mast', entityId: id, before: auditView(before), after: auditView(after) });
  return after;
}

/**
 * Records that a reviewed sighting confirmed the mast (its cells were added or seen): a new row
 * version, so open edit forms learn of the change, and an audit entry naming the sighting.
 */
export async function markMastConfirmed(db: Tx, id: string, sightingId: string, actorId: string): Promise<Mast> {
  const before = await findMastRow(db, id, true);
  await db('masts')
    .where({ id })
    .update({ row_version: db.raw('row_version + 1'), updated_at: db.fn.now(), updated_by: actorId });
  const after = await findMastRow(db, id);
  await recordAudit(db, {
    userId: actorId,
    action: 'merge_sighting',
    entity: 'mast',
    entityId: id,
    before: auditView(before),
    after: { ...auditView(after), sighting_id: sightingId },
  });
  return after;
}

/** Deletes a mast and its cells (readings keep their values and lose the match). */
export async function deleteMast(db: Tx, id: string, rowVersion: number | undefined, actorId: string): Promise<void> {
  const before = await findMastRow(db, id, true);
  if (rowVersion !== undefined && before.rowVersion !== rowVersion) throw staleVersion(before.rowVersion);
  const cells = await listCellsForMast(db, id);
  const cellIds = cells.map((c) => c.id);
  await assertNoPlansUseCells(db, cellIds, `Mast “${before.name}”`);
  const readingsUnlinked = await unlinkReadingsOfCells(db, cellIds);
  await db('masts').where({ id }).delete();
  await recordAudit(db, {
    userId: actorId,
    action: 'delete',
    entity: 'mast',
    entityId: id,
    before: { ...auditView(before), cells_deleted: cells.map(cellAuditView), readings_unlinked: readingsUnlinked },
  });
}

const auditView = (m: Mast) => MAST.auditView(m);
