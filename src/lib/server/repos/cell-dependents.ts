// What depends on cells, checked before a mast or cell is deleted: plans that chose a cell keep a
// customer's history (the delete is refused), readings matched to a cell are unlinked and listed
// in the audit entry, so nothing is lost silently.
import type { Tx } from '../db';
import { ConflictError } from '../errors';

const SHOWN = 8;

/** Refuses (409) when any plan has chosen one of the cells, naming the plans and their states. */
export async function assertNoPlansUseCells(db: Tx, cellIds: string[], what: string): Promise<void> {
  if (cellIds.length === 0) return;
  const plans: { id: string; state: string }[] = await db('plans').whereIn('cell_id', cellIds).orderBy('id').select('id', 'state');
  if (plans.length === 0) return;
  const named = plans
    .slice(0, SHOWN)
    .map((p) => `#${p.id} (${p.state})`)
    .join(', ');
  const more = plans.length > SHOWN ? ` and ${plans.length - SHOWN} more` : '';
  throw new ConflictError(
    `${what} is the chosen cell of ${plans.length} plan${plans.length === 1 ? '' : 's'}: ${named}${more}. ` +
      'Move those plans to another cell first, or mark the mast decommissioned instead of deleting it.',
  );
}

/** Unlinks the readings matched to the cells and returns their ids per cell, for the audit entry. */
export async function unlinkReadingsOfCells(db: Tx, cellIds: string[]): Promise<Record<string, string[]>> {
  if (cellIds.length === 0) return {};
  const rows: { id: string; cell_id: string }[] = await db('readings').whereIn('cell_id', cellIds).forUpdate().select('id', 'cell_id');
  await db('readings').whereIn('cell_id', cellIds).update({ cell_id: null });
  const byCell: Record<string, string[]> = {};
  for (const r of rows) (byCell[String(r.cell_id)] ??= []).push(String(r.id));
  for (const ids of Object.values(byCell)) ids.sort((a, b) => Number(a) - Number(b));
  return byCell;
}
