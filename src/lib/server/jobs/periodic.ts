// Periodic work shared by every app instance. Each instance offers a run every `everySeconds`, but
// pg-boss keeps one job per period and queue (a throttled send: singletonSeconds with the queue as
// singleton key) and, by the queue's 'stately' policy, at most one waiting and one running; the
// instance that fetches the job does the run. So with any number of instances each period's run
// happens once. No astro:env here: the app and the tests pass their own boss and work.
import type PgBoss from 'pg-boss';
import { ensureQueue } from './queue';

export interface PeriodicJob {
  /** The queue's name, also the singleton key. */
  queue: string;
  /** One run per this many seconds, across every instance. */
  everySeconds: number;
  /** After this long pg-boss counts a run as failed (default 300 s); the next period tries again. */
  expireInSeconds?: number;
  /** The run's data as this instance knows it; null offers no run this time. */
  data?: () => Record<string, unknown> | null;
  run(data: Record<string, unknown>): Promise<unknown>;
}

export interface PeriodicJobs {
  /** Offers every job's run for the current period now, as the timers do; answers the queues whose run this instance queued. */
  offer(): Promise<string[]>;
  /** Stops this instance's timers and workers (runs already queued stay for the other instances). */
  stop(): Promise<void>;
}

const errorMessage = (err: unknown) => (err instanceof Error ? err.message : String(err));

/** Works the periodic queues on this instance and, with `timers` (default), offers their runs on time. */
export async function startPeriodicJobs(boss: PgBoss, jobs: PeriodicJob[], opts: { timers?: boolean } = {}): Promise<PeriodicJobs> {
  const workers = new Map<string, string>();
  // A queue that cannot start stops the workers already started here, so that a later try starts
  // each one once.
  try {
    await startWorkers();
  } catch (err) {
    for (const queue of workers.keys()) await boss.offWork(queue).catch(() => undefined);
    throw err;
  }
  async function startWorkers() {
    for (const job of jobs) {
      await ensureQueue(boss, { name: job.queue, policy: 'stately', retryLimit: 0, expireInSeconds: job.expireInSeconds ?? 300 });
      // Polling is only the fallback: the instance that queues a run wakes its own worker at once.
      const workerId = await boss.work(job.queue, { batchSize: 1, pollingIntervalSeconds: Math.max(2, job.everySeconds) }, async ([delivered]) => {
        if (!delivered) return;
        try {
          await job.run((delivered.data ?? {}) as Record<string, unknown>);
        } catch (err) {
          console.error(`[bearline] ${job.queue} failed`, errorMessage(err));
          throw err; // recorded as failed by pg-boss; the next period runs again
        }
      });
      workers.set(job.queue, workerId);
    }
  }

  const offerOne = async (job: PeriodicJob): Promise<boolean> => {
    const data = job.data ? job.data() : {};
    if (!data) return false;
    const id = await boss.sendThrottled(job.queue, data, {}, job.everySeconds, job.queue);
    if (id) boss.notifyWorker(workers.get(job.queue)!);
    return id !== null;
  };
  const offer = async () => {
    const queued: string[] = [];
    for (const job of jobs) if (await offerOne(job)) queued.push(job.queue);
    return queued;
  };

  const timers =
    opts.timers === false
      ? []
      : jobs.map((job) => {
          const tick = () => void offerOne(job).catch((err) => console.error(`[bearline] ${job.queue} not queued`, errorMessage(err)));
          tick();
          const timer = setInterval(tick, job.everySeconds * 1000);
          timer.unref();
          return timer;
        });

  return {
    offer,
    stop: async () => {
      for (const timer of timers) clearInterval(timer);
      for (const queue of workers.keys()) await boss.offWork(queue);
    },
  };
}
