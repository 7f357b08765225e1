// Readies an app process for its first shortlist: the elevation grids read into memory, a database
// connection open, and the model's code run once (a shortlist beside a mast), so the first planner to
// ask does not wait for any of it. Started once per process when it starts (process-start.ts).
import { getReadDb } from './db';
import { getAreaProfileSampler, warmElevationGrids } from './elevation-service';
import { buildShortlist } from './shortlist-service';
import { findWarmupPosition, getSearchBox } from './repos/candidates';
import { DEFAULT_SEARCH_RADIUS_M } from '../domain/shortlist';

/** Mount height of the warm-up's kit; any will do, the answer is thrown away. */
const WARMUP_HEIGHT_M = 6;

let warming: Promise<void> | null = null;

export function warmShortlist(): Promise<void> {
  if (!warming) {
    warming = (async () => {
      const t0 = performance.now();
      const grids = await warmElevationGrids();
      const db = getReadDb();
      const at = await findWarmupPosition(db);
      if (at) {
        const profileFor = await getAreaProfileSampler(getSearchBox(at, DEFAULT_SEARCH_RADIUS_M));
        await buildShortlist(db, { at, heightM: WARMUP_HEIGHT_M, cableM: 0, date: new Date() }, profileFor);
      }
      const what = at ? 'one shortlist run' : 'no mast to run a shortlist beside';
      console.log(`[bearline] shortlist warmed up in ${Math.round(performance.now() - t0)} ms (${grids} elevation grids, ${what})`);
    })().catch((err: unknown) => {
      // Only a head start: the first real shortlist does the same work if this failed.
      console.error('[bearline] shortlist warm-up failed', err instanceof Error ? err.message : err);
    });
  }
  return warming;
}
