// The data_versions counters (raised by triggers on every write to the watched tables): caches
// key their entries by them so a write anywhere makes the old entries unreachable.
import type { Tx } from './db';

export type DataKind = 'masts' | 'basemap' | 'elevation' | 'signal';

export async function getDataVersion(db: Tx, kind: DataKind): Promise<string> {
  const row = await db('data_versions').where({ name: kind }).first<{ version: string } | undefined>('version');
  // No row yet (nothing written since the table was emptied) is a version of its own.
  return String(row?.version ?? 0);
}
