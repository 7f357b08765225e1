// Readings: measured samples at a place and time, optionally matched to a cell.
import type { Tx } from '../db';
import { READING, type Reading } from '../../schemas/mast-responses';
import { recordColumns } from './record-sql';

export type { Reading };

/**
 * The latest readings matched to any of a mast's cells, newest first. Readings from install checks
 * (taken at a customer's home) only with `withInstallReadings`.
 */
export async function listRecentReadingsForMast(db: Tx, mastId: string, limit: number, withInstallReadings: boolean): Promise<Reading[]> {
  const rows: Array<Record<string, unknown>> = await db('readings as r')
    .select(recordColumns(db, READING, 'r'))
    .whereIn('r.cell_id', db('cells').select('id').where({ mast_id: mastId }))
    .modify((q) => {
      if (!withInstallReadings) q.whereNull('r.install_check_id');
    })
    .orderBy([
      { column: 'r.taken_at', order: 'desc' },
      { column: 'r.id', order: 'desc' },
    ])
    .limit(limit);
  return rows.map((r) => READING.fromRow(r));
}
