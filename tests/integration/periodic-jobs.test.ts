// Periodic work with several app instances on one database: each period's run happens once.
import { afterEach, describe, expect, it } from 'vitest';
import type PgBoss from 'pg-boss';
import { createBoss } from '../../src/lib/server/jobs/queue';
import { startPeriodicJobs, type PeriodicJob, type PeriodicJobs } from '../../src/lib/server/jobs/periodic';
import { backgroundJobs, REVIEWER_ALERTS_QUEUE } from '../../src/lib/server/background';
import { testDb } from '../helpers/db';

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

async function until(test: () => boolean | Promise<boolean>, ms = 15_000): Promise<void> {
  for (const end = Date.now() + ms; Date.now() < end; await sleep(100)) if (await test()) return;
  throw new Error('timed out');
}

describe('periodic jobs on two instances', () => {
  const bosses: PgBoss[] = [];
  const running: PeriodicJobs[] = [];
  const queues: string[] = [];

  /** Two instances (each its own pg-boss and connections) working the same periodic job. */
  async function twoInstances(job: (instance: string) => PeriodicJob, timers: boolean, staggerMs = 0) {
    queues.push(job('').queue);
    const started: PeriodicJobs[] = [];
    for (const instance of ['a', 'b']) {
      const boss = await createBoss(process.env.DATABASE_URL!);
      bosses.push(boss);
      if (started.length > 0) await sleep(staggerMs);
      started.push(await startPeriodicJobs(boss, [job(instance)], { timers }));
    }
    running.push(...started);
    return started;
  }

  afterEach(async () => {
    for (const r of running.splice(0)) await r.stop();
    for (const b of bosses.splice(0)) {
      for (const q of queues) await b.deleteQueue(q).catch(() => undefined);
      await b.stop({ graceful: false, wait: true });
    }
    queues.length = 0;
  });

  it('runs once when both instances offer the same period', async () => {
    const runs: string[] = [];
    const [a, b] = await twoInstances((instance) => ({ queue: 'test-periodic-once', everySeconds: 60, run: async () => void runs.push(instance) }), false);
    const offered = await Promise.all([a!.offer(), b!.offer(), a!.offer(), b!.offer()]);
    // Exactly one of the four offers queued a run; the others found this period's run already there.
    expect(offered.flat()).toEqual(['test-periodic-once']);
    await until(() => runs.length > 0);
    await sleep(1500);
    expect(runs).toHaveLength(1);
    // Offering again within the same minute adds nothing.
    expect([...(await a!.offer()), ...(await b!.offer())]).toEqual([]);
  });

  it('on their timers, runs once per period however many instances offer it', { timeout: 30_000 }, async () => {
    const runs: Array<{ instance: string; at: number }> = [];
    // Every second; the second instance's timer is half a period behind, so both offer in each period.
    const t0 = Date.now();
    await twoInstances(
      (instance) => ({ queue: 'test-periodic-timed', everySeconds: 1, run: async () => void runs.push({ instance, at: Date.now() }) }),
      true,
      500,
    );
    await sleep(5000);
    for (const r of running.splice(0)) await r.stop();
    const elapsedS = (Date.now() - t0) / 1000;
    const { rows } = await testDb().raw<{ rows: Array<{ slot: string; n: number }> }>(
      `SELECT singleton_on::text AS slot, count(*)::int AS n FROM pgboss.job WHERE name = 'test-periodic-timed' GROUP BY 1`,
    );
    // One job per one-second period (the unique throttle slot), each run by one instance.
    expect(rows.every((r) => r.n === 1)).toBe(true);
    expect(runs.length).toBeGreaterThanOrEqual(3);
    expect(runs.length).toBeLessThanOrEqual(Math.ceil(elapsedS) + 1);
    expect(runs.length).toBeLessThanOrEqual(rows.length);
  });

  it('offers reviewer alerts only once the origin for their links is known', () => {
    let origin: string | null = null;
    const jobs = backgroundJobs(testDb(), {} as PgBoss, { dataDir: '.', residuals: false, origin: () => origin });
    const alerts = jobs.find((j) => j.queue === REVIEWER_ALERTS_QUEUE)!;
    expect(alerts.everySeconds).toBe(60);
    expect(alerts.data!()).toBeNull();
    origin = 'https://bearline.example';
    expect(alerts.data!()).toEqual({ origin: 'https://bearline.example' });
    expect(jobs.map((j) => [j.queue, j.everySeconds])).toEqual([
      ['signal-hexes-check', 10],
      ['reviewer-alerts', 60],
    ]);
  });
});
