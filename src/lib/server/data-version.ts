// The data_versions counters (raised by triggers on every write to the watched tables): caches
// key their entries by them so a write anywhere makes the old entries unreachable. While the change
// feed is live the current versions are known in memory (no round trip); after a write on this
// machine (write-epoch.ts) or without the feed, they are read from the database.
import type { Tx } from './db';
import { getChangeFeed } from './change-feed';
import { currentWriteEpoch } from './write-epoch';

/** Kinds raised by the migrations' triggers; any other name is a kind of its own too. */
export type DataKind = 'masts' | 'basemap' | 'elevation' | 'signal' | (string & {});

/** The write marker each kind was last read from the database at. */
const readAtEpoch = new Map<string, string>();

export async function getDataVersion(db: Tx, kind: DataKind): Promise<string> {
  const feed = getChangeFeed();
  const epoch = currentWriteEpoch();
  if (feed?.isLive && readAtEpoch.get(kind) === epoch) {
    const known = feed.version(kind);
    if (known !== null) return known;
  }
  const row = await db('data_versions').where({ name: kind }).first<{ version: string } | undefined>('version');
  // No row yet (nothing written since the table was emptied) is a version of its own.
  const version = String(row?.version ?? 0);
  if (feed?.isLive) {
    feed.observe(kind, version);
    readAtEpoch.set(kind, epoch);
    return feed.version(kind) ?? version;
  }
  return version;
}
