// Background jobs as people see them (state, progress, counts, errors); pg-boss delivers them.
import type { Tx } from '../db';
import type { JobJson, JobState } from '../../schemas/jobs';
import type { RowError } from '../csv-copy';

export interface JobRecord {
  id: string;
  queue: string;
  ownerId: string | null;
  title: string;
  state: JobState;
  progress: number;
  phase: string | null;
  counts: Record<string, number>;
  errors: RowError[];
  errorCount: number;
  message: string | null;
  attempts: number;
  createdAt: Date;
  startedAt: Date | null;
  finishedAt: Date | null;
}

type JobRow = Omit<JobJson, 'id' | 'owner_id' | 'created_at' | 'started_at' | 'finished_at'> & {
  id: string;
  owner_id: string | null;
  created_at: Date;
  started_at: Date | null;
  finished_at: Date | null;
};

function toJob(r: JobRow): JobRecord {
  return {
    id: r.id,
    queue: r.queue,
    ownerId: r.owner_id === null ? null : String(r.owner_id),
    title: r.title,
    state: r.state,
    progress: r.progress,
    phase: r.phase,
    counts: r.counts,
    errors: r.errors,
    errorCount: r.error_count,
    message: r.message,
    attempts: r.attempts,
    createdAt: r.created_at,
    startedAt: r.started_at,
    finishedAt: r.finished_at,
  };
}

export function jobJson(j: JobRecord): JobJson {
  return {
    id: j.id,
    queue: j.queue,
    owner_id: j.ownerId,
    title: j.title,
    state: j.state,
    progress: j.progress,
    phase: j.phase,
    counts: j.counts,
    errors: j.errors,
    error_count: j.errorCount,
    message: j.message,
    attempts: j.attempts,
    created_at: j.createdAt.toISOString(),
    started_at: j.startedAt?.toISOString() ?? null,
    finished_at: j.finishedAt?.toISOString() ?? null,
  };
}

const COLUMNS = [
  'id',
  'queue',
  'owner_id',
  'title',
  'state',
  'progress',
  'phase',
  'counts',
  'errors',
  'error_count',
  'message',
  'attempts',
  'created_at',
  'started_at',
  'finished_at',
];

export async function createJobRecord(
  db: Tx,
  job: { id: string; queue: string; ownerId: string | null; title: string; counts?: Record<string, number> },
): Promise<void> {
  await db('jobs').insert({ id: job.id, queue: job.queue, owner_id: job.ownerId, title: job.title, counts: JSON.stringify(job.counts ?? {}) });
}

export async function findJob(db: Tx, id: string): Promise<JobRecord | null> {
  const row: JobRow | undefined = await db('jobs').select(COLUMNS).where({ id }).first();
  return row ? toJob(row) : null;
}

export async function listJobs(db: Tx, opts: { limit: number; offset: number; ownerId?: string }): Promise<{ items: JobRecord[]; total: number }> {
  const base = db('jobs');
  if (opts.ownerId) base.where({ owner_id: opts.ownerId });
  const [{ count }] = await base.clone().count<{ count: string }[]>('* as count');
  const rows: JobRow[] = await base
    .select(COLUMNS)
    .orderBy([{ column: 'created_at', order: 'desc' }, { column: 'id' }])
    .limit(opts.limit)
    .offset(opts.offset);
  return { items: rows.map(toJob), total: Number(count) };
}

/** A worker takes the job (again, after a retry): attempts + 1, progress from 0. */
export async function markJobActive(db: Tx, id: string): Promise<void> {
  await db('jobs')
    .where({ id })
    .update({ state: 'active', progress: 0, phase: null, message: null, attempts: db.raw('attempts + 1'), started_at: db.fn.now(), heartbeat_at: db.fn.now() });
}

export async function reportJobProgress(db: Tx, id: string, progress: number, phase: string, counts?: Record<string, number>): Promise<void> {
  const change: Record<string, unknown> = { progress: Math.max(0, Math.min(100, Math.round(progress))), phase, heartbeat_at: db.fn.now() };
  if (counts) change.counts = JSON.stringify(counts);
  await db('jobs').where({ id }).whereIn('state', ['active']).update(change);
}

export async function completeJobRecord(db: Tx, id: string, result: { counts: Record<string, number>; message: string }): Promise<void> {
  await db('jobs')
    .where({ id })
    .update({
      state: 'completed',
      progress: 100,
      phase: 'done',
      counts: JSON.stringify(result.counts),
      message: result.message,
      finished_at: db.fn.now(),
      heartbeat_at: null,
    });
}

/** A failed attempt: `final` when the queue will not retry it (bad data, or retries used up). */
export async function failJobRecord(db: Tx, id: string, result: { message: string; errors?: RowError[]; errorCount?: number; final: boolean }): Promise<void> {
  await db('jobs')
    .where({ id })
    .update({
      state: result.final ? 'failed' : 'retry',
      message: result.message,
      errors: JSON.stringify(result.errors ?? []),
      error_count: result.errorCount ?? 0,
      finished_at: result.final ? db.fn.now() : null,
      heartbeat_at: null,
    });
}

/** Jobs a worker took but has not reported on for `staleSeconds` (its process died). */
export async function listStalledJobs(db: Tx, staleSeconds: number): Promise<Array<{ id: string; queue: string }>> {
  return db('jobs').select('id', 'queue').where({ state: 'active' }).whereRaw('heartbeat_at < now() - make_interval(secs => ?)', [staleSeconds]);
}
