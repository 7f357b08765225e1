// Cells: one operator's carrier on one sector of a mast. Writes are checked against the 3GPP
// channel tables (CellInputSchema) and audited.
import type { Tx } from '../db';
import { CELL, CellInputSchema, type Cell, type CellChange, type CellInput } from '../../schemas/masts';
import { ConflictError, NotFoundError, ValidationError } from '../errors';
import { recordAudit } from './audit';
import { assertNoPlansUseCells, unlinkReadingsOfCells } from './cell-dependents';
import { recordColumns } from './record-sql';

export type { Cell };

function selectCells(db: Tx) {
  return db('cells as c')
    .join('operators as o', 'o.id', 'c.operator_id')
    .select(recordColumns(db, CELL, 'c'));
}

/** A mast's cells by operator, technology, frequency and sector. */
export async function listCellsForMast(db: Tx, mastId: string): Promise<Cell[]> {
  const rows: Array<Record<string, unknown>> = await selectCells(db)
    .where('c.mast_id', mastId)
    .orderBy([{ column: 'c.operator_id' }, { column: 'c.tech' }, { column: 'c.dl_mhz' }, { column: 'c.sector_azimuth_deg' }, { column: 'c.id' }]);
  return rows.map((r) => CELL.fromRow(r));
}

/** Like listCellsForMast, but 404 when the mast does not exist. */
export async function listCellsOfExistingMast(db: Tx, mastId: string): Promise<Cell[]> {
  if (!(await db('masts').where({ id: mastId }).first('id'))) throw new NotFoundError('Mast not found');
  return listCellsForMast(db, mastId);
}

export async function findCell(db: Tx, id: string): Promise<Cell> {
  const row: Record<string, unknown> | undefined = await selectCells(db).where('c.id', id).first();
  if (!row) throw new NotFoundError('Cell not found');
  return CELL.fromRow(row);
}

async function assertOperatorExists(db: Tx, operatorId: string): Promise<void> {
  if (!(await db('operators').where({ id: operatorId }).first('id'))) {
    throw new ValidationError('Some fields need attention', { operator_id: ['Unknown operator'] });
  }
}

/** The columns of a checked cell (no downlink frequency when the channel is in no band). */
const toRow = (input: CellInput) => CELL.insertRow({ ...input, dlMhz: Number.isFinite(input.dlMhz) ? input.dlMhz : null });

export async function createCell(db: Tx, mastId: string, input: CellInput, actorId: string | null): Promise<Cell> {
  if (!(await db('masts').where({ id: mastId }).first('id'))) throw new NotFoundError('Mast not found');
  await assertOperatorExists(db, input.operatorId);
  const [row] = await db('cells')
    .insert({ mast_id: mastId, ...toRow(input) })
    .returning('id');
  const cell = await findCell(db, String(row.id));
  await recordAudit(db, { userId: actorId, action: 'create', entity: 'cell', entityId: cell.id, after: auditView(cell) });
  return cell;
}

/**
 * Applies a partial change and checks the whole cell again. A new technology or channel without a
 * band derives the band from the channel.
 */
export async function updateCell(db: Tx, id: string, change: CellChange, actorId: string): Promise<Cell> {
  const before = await findCell(db, id);
  const keepBand = change.band === undefined && change.tech === undefined && change.channel === undefined;
  const given = Object.fromEntries(Object.entries(change).filter(([, v]) => v !== undefined));
  const merged = CellInputSchema.parse({
    ...CELL.asBody(before),
    ...given,
    band: change.band !== undefined ? change.band : keepBand ? before.band : null,
  });
  if (merged.operatorId !== before.operatorId) await assertOperatorExists(db, merged.operatorId);
  const updated = await db('cells')
    .where(change.row_version === undefined ? { id } : { id, row_version: change.row_version })
    .update({ ...toRow(merged), updated_at: db.fn.now(), row_version: db.raw('row_version + 1') });
  if (updated === 0) {
    throw new ConflictError(`Someone else changed this cell (now version ${before.rowVersion}); reload it and make your change again`);
  }
  const after = await findCell(db, id);
  await recordAudit(db, { userId: actorId, action: 'update', entity: 'cell', entityId: id, before: auditView(before), after: auditView(after) });
  return after;
}

export async function deleteCell(db: Tx, id: string, actorId: string): Promise<void> {
  const before = await findCell(db, id);
  await assertNoPlansUseCells(db, [id], `Cell ${id}`);
  const readingsUnlinked = await unlinkReadingsOfCells(db, [id]);
  await db('cells').where({ id }).delete();
  await recordAudit(db, {
    userId: actorId,
    action: 'delete',
    entity: 'cell',
    entityId: id,
    before: { ...auditView(before), readings_unlinked: readingsUnlinked[id] ?? [] },
  });
}

/** The audited fields of a cell (also listed in a deleted mast's audit entry). */
export const cellAuditView = (c: Cell) => ({ id: c.id, ...auditView(c) });

const auditView = (c: Cell) => CELL.auditView(c);
