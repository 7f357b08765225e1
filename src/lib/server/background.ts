// The app's periodic work, each run done by one app instance whatever their number (jobs/periodic.ts):
// the signal map check (readings changed outside an import: install checks, erasures, deletes), the
// residual job's rounds, and telling reviewers that sightings wait (state in reviewer_alerts, so
// nobody is mailed twice). No astro:env here: runtime.ts passes the configuration.
import type { Knex } from 'knex';
import type PgBoss from 'pg-boss';
import type { PeriodicJob } from './jobs/periodic';
import { alertReviewers } from './review-mail';
import { runResidualRound } from './residual-job';
import { requestSignalHexesRefresh } from './signal-hexes-job';

export const SIGNAL_CHECK_QUEUE = 'signal-hexes-check';
export const RESIDUALS_QUEUE = 'residuals';
export const REVIEWER_ALERTS_QUEUE = 'reviewer-alerts';

export interface BackgroundOptions {
  /** Where the elevation samples live (the app's DATA_DIR). */
  dataDir: string;
  /** False leaves the residual job to someone else (RESIDUAL_JOB=off: the benchmark runs it itself). */
  residuals: boolean;
  /** The origin for links in mail (PUBLIC_ORIGIN, else the one requests came to); null while unknown. */
  origin: () => string | null;
}

export function backgroundJobs(db: Knex, boss: PgBoss, opts: BackgroundOptions): PeriodicJob[] {
  const jobs: PeriodicJob[] = [{ queue: SIGNAL_CHECK_QUEUE, everySeconds: 10, run: () => requestSignalHexesRefresh(db, boss) }];
  if (opts.residuals) {
    jobs.push({ queue: RESIDUALS_QUEUE, everySeconds: 10, expireInSeconds: 15 * 60, run: () => runResidualRound(db, opts.dataDir) });
  }
  jobs.push({
    queue: REVIEWER_ALERTS_QUEUE,
    everySeconds: 60,
    data: () => {
      const origin = opts.origin();
      return origin ? { origin } : null;
    },
    run: (data) => alertReviewers(db, String(data.origin)),
  });
  return jobs;
}

let requestOrigin: string | null = null;

/** Remembers the origin requests come to (the middleware), for links when PUBLIC_ORIGIN is not set. */
export function rememberRequestOrigin(origin: string): void {
  requestOrigin ??= origin.replace(/\/+$/, '');
}

export function knownOrigin(publicOrigin: string | undefined): string | null {
  return publicOrigin ? publicOrigin.replace(/\/+$/, '') : requestOrigin;
}
