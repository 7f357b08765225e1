// The app's job queue and workers: started once per process, on the first request (every app
// instance works jobs; the start script's health check makes that happen at start-up).
import type PgBoss from 'pg-boss';
import { config } from '../config';
import { getDb } from '../db';
import { readingsImportHandler } from '../readings-import';
import { requestSignalHexesRefresh, signalHexesHandler } from '../signal-hexes-job';
import { createBoss, READINGS_IMPORT_QUEUE, SIGNAL_HEXES_QUEUE, startWorkers, type JobHandler } from './queue';

/** How often each instance looks for readings changed outside an import (install checks, deletes). */
const SIGNAL_CHECK_MS = 10_000;

let booting: Promise<PgBoss> | null = null;
let signalTimer: ReturnType<typeof setInterval> | null = null;

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
      const check = () => void requestSignalHexesRefresh(db, boss).catch(logFailure('signal map check failed'));
      check();
      signalTimer = setInterval(check, SIGNAL_CHECK_MS);
      signalTimer.unref();
      return boss;
    })();
    booting.catch((err) => {
      logFailure('job queue did not start')(err);
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
  if (signalTimer) clearInterval(signalTimer);
  signalTimer = null;
  if (current) await (await current.catch(() => null))?.stop({ graceful: false, wait: true });
}
