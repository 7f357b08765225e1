// The app's job queue and workers: started once per process (server/serve.mjs starts them when the
// process starts, see process-start.ts; otherwise the first request does). Every app instance works
// jobs; the periodic ones (background.ts) run once per period whatever the number of instances.
import type PgBoss from 'pg-boss';
import { config } from '../config';
import { getDb } from '../db';
import { readingsImportHandler } from '../readings-import';
import { requestSignalHexesRefresh, signalHexesHandler } from '../signal-hexes-job';
import { backgroundJobs, knownOrigin } from '../background';
import { createBoss, READINGS_IMPORT_QUEUE, SIGNAL_HEXES_QUEUE, startWorkers, type JobHandler } from './queue';
import { startPeriodicJobs, type PeriodicJobs } from './periodic';

let booting: Promise<PgBoss> | null = null;
let periodic: Promise<PeriodicJobs | null> | null = null;

const logFailure = (what: string) => (err: unknown) => console.error(`[bearline] ${what}`, err instanceof Error ? err.message : err);

/** The queue, started with this instance's workers on first use. */
export function getJobQueue(): Promise<PgBoss> {
  if (!booting) {
    if (!config.databaseUrl) return Promise.reject(new Error('DATABASE_URL is not set'));
    booting = (async () => {
      const boss = await createBoss(config.databaseUrl!);
      const db = getDb();
      const importReadings = readingsImportHandler(db);
      // An import changes the signal map: its hexagons are recomputed right after.
      const importThenRefresh: JobHandler = async (data, ctx) => {
        const outcome = await importReadings(data, ctx);
        await requestSignalHexesRefresh(db, boss).catch(logFailure('signal map refresh request failed'));
        return outcome;
      };
      await startWorkers(db, boss, { [READINGS_IMPORT_QUEUE]: importThenRefresh, [SIGNAL_HEXES_QUEUE]: signalHexesHandler(db) });
      return boss;
    })();
    booting.catch((err) => {
      logFailure('job queue did not start')(err);
      booting = null;
    });
  }
  return booting;
}

/** Starts the queue and this instance's share of the periodic work once per process (tried again on the next call after a failure), never failing a request. */
export function startBackgroundWork(): void {
  if (periodic || !config.databaseUrl) return;
  periodic = getJobQueue()
    .then((boss) =>
      startPeriodicJobs(
        boss,
        backgroundJobs(getDb(), boss, {
          dataDir: config.dataDir,
          residuals: process.env.RESIDUAL_JOB !== 'off',
          origin: () => knownOrigin(config.publicOrigin),
        }),
      ),
    )
    .catch((err) => {
      logFailure('background work did not start')(err);
      periodic = null;
      return null;
    });
}

/** Stops this instance's workers, periodic work and the queue's connections (tests, shutdown). */
export async function stopJobQueue(): Promise<void> {
  const current = booting;
  const work = periodic;
  booting = null;
  periodic = null;
  await (await work)?.stop();
  if (current) await (await current.catch(() => null))?.stop({ graceful: false, wait: true });
}
