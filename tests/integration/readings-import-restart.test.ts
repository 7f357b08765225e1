import { spawn } from 'node:child_process';
import { afterAll, describe, expect, it } from 'vitest';
import type PgBoss from 'pg-boss';
import { createBoss, READINGS_IMPORT_QUEUE, startWorkers } from '../../src/lib/server/jobs/queue';
import { readingsImportHandler, stageReadingsUpload } from '../../src/lib/server/readings-import';
import { findJob } from '../../src/lib/server/repos/jobs';
import { testDb, truncateAll } from '../helpers/db';
import { makeUser } from '../helpers/factories';
import { buildReadingsFixture, readingCsv } from '../helpers/readings-fixture';
import { Readable } from 'node:stream';

const count = async (table: string) => Number((await testDb()(table).count('* as n').first())!.n);

describe('a readings import whose worker is killed', () => {
  let boss: PgBoss | null = null;
  afterAll(async () => boss?.stop({ graceful: false, wait: true }));

  it('leaves no half-import, and another instance retries it to the end', { timeout: 180_000 }, async () => {
    await truncateAll();
    await buildReadingsFixture();
    const owner = await makeUser('surveyor');
    boss = await createBoss(process.env.DATABASE_URL!);
    const staged = await testDb().transaction((trx) =>
      stageReadingsUpload(trx, boss!, Readable.from([readingCsv(10_000)]), { fileName: 'day.csv', ownerId: owner.id, now: new Date() }),
    );

    // Instance 1 takes the job and dies in the middle of it.
    const child = spawn(process.execPath, ['--import', 'tsx', 'tests/helpers/import-worker-child.ts'], { env: process.env, stdio: 'inherit' });
    const signal = await new Promise<NodeJS.Signals | null>((resolve) => child.on('exit', (_code, sig) => resolve(sig)));
    expect(signal).toBe('SIGKILL');
    const dead = await findJob(testDb(), staged.jobId);
    expect(dead!.state).toBe('active');
    expect(dead!.progress).toBeGreaterThan(0);
    expect(dead!.progress).toBeLessThan(90);
    expect(await count('readings')).toBe(0);
    expect((await testDb()('reading_imports').where({ id: staged.importId }).first()).status).toBe('staged');

    // Instance 2 starts: it hands the silent job back to the queue and works the retry.
    await testDb()('jobs')
      .where({ id: staged.jobId })
      .update({ heartbeat_at: testDb().raw("now() - interval '10 minutes'") });
    const stop = await startWorkers(
      testDb(),
      boss,
      { [READINGS_IMPORT_QUEUE]: readingsImportHandler(testDb()) },
      { sweepSeconds: 0, pollingIntervalSeconds: 1 },
    );
    try {
      let job = await findJob(testDb(), staged.jobId);
      for (let i = 0; i < 120 && job!.state !== 'completed' && job!.state !== 'failed'; i++) {
        await new Promise((r) => setTimeout(r, 1000));
        job = await findJob(testDb(), staged.jobId);
      }
      expect(job).toMatchObject({ state: 'completed', attempts: 2, counts: { rows: 10_000, imported: 10_000, matched: 10_000 } });
    } finally {
      await stop();
    }
    expect(await count('readings')).toBe(10_000);
    expect(await count('reading_import_rows')).toBe(0);
  });
});
