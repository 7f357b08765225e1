// What an app process starts once: the job queue with its share of the periodic work, the feed of
// data changes from PostgreSQL, and the shortlist's warm-up. server/serve.mjs calls it as soon as the
// process listens (through the hook below, set when Astro's middleware module loads); the middleware
// calls it on every request too, which starts it under `astro dev` and is a no-op afterwards.
import { config } from './config';
import { startChangeFeed } from './change-feed';
import { startBackgroundWork } from './jobs/runtime';
import { warmShortlist } from './shortlist-warmup';

let started = false;

export function startProcessWork(): void {
  if (!config.databaseUrl) return;
  // Again on later calls until it has started (the database may have been down at first).
  startBackgroundWork();
  if (started) return;
  started = true;
  // Elevation grids in memory and the shortlist's code run once, before the first planner asks.
  void warmShortlist();
  startChangeFeed(config.databaseUrl);
}

/** The hook server/serve.mjs calls (it cannot import this module: Astro bundles it). */
export const PROCESS_START_HOOK = Symbol.for('bearline.startProcessWork');
(globalThis as Record<symbol, unknown>)[PROCESS_START_HOOK] = startProcessWork;
