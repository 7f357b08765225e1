// Background jobs as people see them (state, progress, counts, errors); pg-boss delivers them.
import type { Tx } from '../db';
import { JOB, type JobRecord } from '../../schemas/jobs';
import type { RowError } from '../csv-copy';
import { recordColumns } from './record-sql';

export type { JobRecord };

const selectJobs = (db: Tx) => db('jobs as j').select(recordColumns(db, JOB, 'j'));

export async function createJobRecord(
  db: Tx,
  job: { id: string; queue: string; ownerId: string | null; title: string; counts?: Record<string, number> },
): Promise<void> {
  await db('jobs').insert({ id: job.id, queue: job.queue, owner_id: job.ownerId, title: job.title, counts: JSON.stringify(job.counts ?? {}) });
}

export async function findJob(db: Tx, id: string): Promise<JobRecord | null> {
  const row = await selectJobs(db).where('j.id', id).first();
  return row ? JOB.fromRow(row) : null;
}

export async function listJobs(db: Tx, opts: { limit: number; offset: number; ownerId?: string }): Promise<{ items: JobRecord[]; total: number }> {
  const filtered = (q: ReturnType<Tx>) => (opts.ownerId ? q.where('j.owner_id', opts.ownerId) : q);
  const [{ count }] = await filtered(db('jobs as j')).count<{ count: string }[]>('* as count');
  const rows = await filtered(selectJobs(db))
    .orderBy([{ column: 'j.created_at', order: 'desc' }, { column: 'j.id' }])
    .limit(opts.limit)
    .offset(opts.offset);
  return { items: rows.map((r: Record<string, unknown>) => JOB.fromRow(r)), total: Number(count) };
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
