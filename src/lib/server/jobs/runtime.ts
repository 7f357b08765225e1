// The app's job queue and workers: started once per process, on the first request (every app
// instance works jobs; the start script's health check makes that happen at start-up).
import type PgBoss from 'pg-boss';
import { config } from '../config';
import { getDb } from '../db';
import { readingsImportHandler } from '../readings-import';
import { createBoss, READINGS_IMPORT_QUEUE, startWorkers } from './queue';

let booting: Promise<PgBoss> | null = null;

/** The queue, started with this instance's workers on first use. */
export function getJobQueue(): Promise<PgBoss> {
  if (!booting) {
    if (!config.databaseUrl) return Promise.reject(new Error('DATABASE_URL is not set'));
    booting = (async () => {
      const boss = await createBoss(config.databaseUrl!);
      await startWorkers(getDb(), boss, { [READINGS_IMPORT_QUEUE]: readingsImportHandler(getDb()) });
      return boss;
    })();
    booting.catch((err) => {
      console.error('[bearline] job queue did not start', err instanceof Error ? err.message : err);
      booting = null;
    });
  }
  return booting;
}

/** Starts the queue in the background (from the middleware), never failing a request. */
export function startJobQueueInBackground(): void {
  if (!booting && config.databaseUrl) getJobQueue().catch(() => undefined);
}

/** Stops this instance's workers and the queue's connections (tests, shutdown). */
export async function stopJobQueue(): Promise<void> {
  const current = booting;
  booting = null;
  if (current) await (await current.catch(() => null))?.stop({ graceful: false, wait: true });
}
