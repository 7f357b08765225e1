// The job queue: pg-boss (PostgreSQL, schema "pgboss"), so every app instance can send and work
// jobs. Our `jobs` table carries what people see; pg-boss owns delivery and retries. No astro:env
// here: the app, scripts and tests each pass their own connection and Knex.
import PgBoss from 'pg-boss';
import type { Knex } from 'knex';
import type { PoolClient } from 'pg';
import { completeJobRecord, createJobRecord, failJobRecord, listStalledJobs, markJobActive, reportJobProgress } from '../repos/jobs';
import type { RowError } from '../csv-copy';

export const READINGS_IMPORT_QUEUE = 'readings-import';
/** Recomputes the measured signal hexagons where readings changed (repos/reading-hexes.ts). */
export const SIGNAL_HEXES_QUEUE = 'signal-hexes';

/** Queues and their retry policy. An import is one transaction, so retrying it is always safe. */
const QUEUES: Record<string, PgBoss.Queue> = {
  [READINGS_IMPORT_QUEUE]: { name: READINGS_IMPORT_QUEUE, retryLimit: 3, retryDelay: 5, retryBackoff: true, expireInSeconds: 30 * 60 },
  // 'short': at most one waiting; a request while one waits adds nothing (that one will see every
  // change). Runs themselves take turns on an advisory lock, and each is one transaction.
  [SIGNAL_HEXES_QUEUE]: { name: SIGNAL_HEXES_QUEUE, policy: 'short', retryLimit: 5, retryDelay: 10, retryBackoff: true, expireInSeconds: 60 * 60 },
};

/** A job failure that retrying cannot fix (bad data): the job fails at once with this report. */
export class PermanentJobError extends Error {
  constructor(
    message: string,
    readonly errors: RowError[] = [],
    readonly errorCount = 0,
  ) {
    super(message);
  }
}

export interface JobContext {
  jobId: string;
  /** Progress 0–100 with a phase name; also the heartbeat that tells other instances this job is alive. */
  progress(progress: number, phase: string, counts?: Record<string, number>): Promise<void>;
}

export interface JobOutcome {
  counts: Record<string, number>;
  message: string;
}

export type JobHandler = (data: Record<string, unknown>, ctx: JobContext) => Promise<JobOutcome>;

export async function createBoss(connectionString: string, options: Partial<PgBoss.ConstructorOptions> = {}): Promise<PgBoss> {
  const boss = new PgBoss({ connectionString, max: 4, application_name: 'bearline-jobs', ...options });
  boss.on('error', (err) => console.error('[bearline] job queue', err instanceof Error ? err.message : err));
  await boss.start();
  for (const queue of Object.values(QUEUES)) await ensureQueue(boss, queue);
  return boss;
}

/**
 * Creates the queue with these options unless it exists (any instance may be first). Two instances
 * starting together may both try: one gets a unique violation or is chosen as a deadlock's victim
 * while the other's creation has not committed yet, so it looks again after a short pause.
 */
export async function ensureQueue(boss: PgBoss, queue: PgBoss.Queue, attempts = 4): Promise<void> {
  for (let attempt = 1; ; attempt++) {
    if (await boss.getQueue(queue.name)) return;
    try {
      await boss.createQueue(queue.name, queue);
      return;
    } catch (err) {
      if (attempt >= attempts) throw err;
      await new Promise((resolve) => setTimeout(resolve, 100 * attempt + Math.random() * 200));
    }
  }
}

/**
 * Queues a job inside the caller's transaction (its pg connection), with our record of it: both
 * or neither, so an upload is never left without its job.
 */
export async function sendJobInTransaction(
  boss: PgBoss,
  trx: Knex.Transaction,
  conn: PoolClient,
  job: { id: string; queue: string; ownerId: string | null; title: string; data: Record<string, unknown>; counts?: Record<string, number> },
): Promise<void> {
  await createJobRecord(trx, job);
  await boss.send(job.queue, job.data, { id: job.id, db: { executeSql: (text, values) => conn.query(text, values) } });
}

const errorMessage = (err: unknown) => (err instanceof Error ? err.message : String(err));

/** Runs one delivered job, keeping our record in step. Throws to let pg-boss retry. */
export async function runJob(db: Knex, boss: PgBoss, queue: string, job: { id: string; data: unknown }, handler: JobHandler): Promise<void> {
  await markJobActive(db, job.id);
  const ctx: JobContext = { jobId: job.id, progress: (p, phase, counts) => reportJobProgress(db, job.id, p, phase, counts) };
  try {
    const outcome = await handler(job.data as Record<string, unknown>, ctx);
    await completeJobRecord(db, job.id, outcome);
  } catch (err) {
    if (err instanceof PermanentJobError) {
      await failJobRecord(db, job.id, { message: err.message, errors: err.errors, errorCount: err.errorCount, final: true });
      return; // nothing to retry: the job is done, as failed
    }
    const meta = await boss.getJobById(queue, job.id);
    const final = !meta || meta.retryCount >= meta.retryLimit;
    console.error(`[bearline] job ${job.id} (${queue}) failed`, errorMessage(err));
    await failJobRecord(db, job.id, { message: final ? `Failed: ${errorMessage(err)}` : `Failed, will retry: ${errorMessage(err)}`, final });
    throw err;
  }
}

export interface WorkerOptions {
  /** A job whose worker has not reported for this long is handed back to the queue (default 120 s). */
  staleSeconds?: number;
  /** How often to look for such jobs (default 30 s; 0 looks once, at start). */
  sweepSeconds?: number;
  pollingIntervalSeconds?: number;
}

/**
 * Works the queues on this instance and hands back jobs whose worker died (no heartbeat): pg-boss
 * retries them, and because every job is one transaction, a retried job never finds half of itself.
 * Returns a stop function.
 */
export async function startWorkers(db: Knex, boss: PgBoss, handlers: Record<string, JobHandler>, opts: WorkerOptions = {}): Promise<() => Promise<void>> {
  const staleSeconds = opts.staleSeconds ?? 120;
  for (const [queue, handler] of Object.entries(handlers)) {
    await boss.work(queue, { batchSize: 1, pollingIntervalSeconds: opts.pollingIntervalSeconds ?? 2 }, async ([job]) => {
      if (job) await runJob(db, boss, queue, job, handler);
    });
  }
  const sweep = () => reclaimStalledJobs(db, boss, staleSeconds).catch((err) => console.error('[bearline] job sweep', errorMessage(err)));
  await sweep();
  const timer = opts.sweepSeconds === 0 ? null : setInterval(sweep, (opts.sweepSeconds ?? 30) * 1000);
  timer?.unref();
  return async () => {
    if (timer) clearInterval(timer);
    for (const queue of Object.keys(handlers)) await boss.offWork(queue);
  };
}

/** Fails stalled jobs in pg-boss, which puts them back for a retry (or fails them for good). */
export async function reclaimStalledJobs(db: Knex, boss: PgBoss, staleSeconds: number): Promise<number> {
  const stalled = await listStalledJobs(db, staleSeconds);
  for (const job of stalled) {
    await boss.fail(job.queue, job.id, { message: 'the worker stopped answering' });
    const meta = await boss.getJobById(job.queue, job.id);
    const final = !meta || meta.state === 'failed';
    await failJobRecord(db, job.id, { message: final ? 'The worker stopped; no retries left' : 'The worker stopped; the job will be retried', final });
  }
  return stalled.length;
}
