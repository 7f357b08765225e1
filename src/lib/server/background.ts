// Periodic work of an app server: for now, telling reviewers that sightings wait. Every server
// runs it; the state lives in PostgreSQL (reviewer_alerts), so nobody is mailed twice.
import { getDb } from './db';
import { config } from './config';
import { alertReviewers } from './review-mail';

const REVIEWER_ALERT_CHECK_MS = 60_000;

let started = false;

/** Starts the periodic checks once per process; `origin` is used for links when PUBLIC_ORIGIN is not set. */
export function startBackgroundWork(origin: string): void {
  if (started) return;
  started = true;
  const tick = () => {
    alertReviewers(getDb(), (config.publicOrigin ?? origin).replace(/\/+$/, '')).catch((err) =>
      console.error('[bearline] reviewer alerts failed', err instanceof Error ? err.message : err),
    );
  };
  setTimeout(tick, 5_000).unref();
  setInterval(tick, REVIEWER_ALERT_CHECK_MS).unref();
}
