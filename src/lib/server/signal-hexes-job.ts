// The signal-hexes job: recomputes the measured signal map's hexagons where readings changed. Asked
// for after every readings import, and by each app instance whenever it finds changes waiting
// (install checks, erasures, deletes and edits record theirs in reading_hex_dirty by trigger).
import type { Knex } from 'knex';
import type PgBoss from 'pg-boss';
import { SIGNAL_HEXES_QUEUE, type JobHandler } from './jobs/queue';
import { hasDirtyReadingHexes, refreshReadingHexes } from './repos/reading-hexes';

export function signalHexesHandler(db: Knex): JobHandler {
  return async (_data, ctx) => {
    const result = await refreshReadingHexes(db, (done, total) => ctx.progress((100 * done) / total, 'recomputing hexagons'));
    return {
      counts: { areas: result.areas, rows: result.rows },
      message:
        result.areas === 0
          ? 'Nothing had changed'
          : `Recomputed ${result.rows} hexagon rows ${result.everywhere ? 'everywhere' : `in ${result.areas} changed areas`}`,
    };
  };
}

/** Queues a recomputation when readings changed since the last one; true when one was asked for. */
export async function requestSignalHexesRefresh(db: Knex, boss: PgBoss): Promise<boolean> {
  if (!(await hasDirtyReadingHexes(db))) return false;
  await boss.send(SIGNAL_HEXES_QUEUE, {});
  return true;
}
