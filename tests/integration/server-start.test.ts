// The built app warms its shortlist when each worker starts, not on the worker's first request, and
// answers health checks meanwhile (server/serve.mjs starts the app's own work once it listens).
import { describe, expect, it } from 'vitest';
import { existsSync } from 'node:fs';
import { startServer } from '../../scripts/lib/server-process';
import { freePort } from '../helpers/free-port';
import { testDb, truncateAll } from '../helpers/db';
import { buildReadingsFixture } from '../helpers/readings-fixture';
import { seed as seedCatalogue } from '../../seeds/05_demo_catalogue';

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

describe('an app worker starting', () => {
  it('warms the shortlist before any request, in each worker', { timeout: 120_000 }, async () => {
    expect(existsSync('dist/server/entry.mjs')).toBe(true); // scripts/test.ts builds before the tests
    await truncateAll();
    // A mast to run the warm-up shortlist beside, and antennas to run it with.
    await buildReadingsFixture();
    await seedCatalogue(testDb());
    const port = await freePort();
    const server = startServer({
      host: '127.0.0.1',
      port,
      stdio: 'pipe',
      env: { DATABASE_URL: process.env.DATABASE_URL!, WEB_CONCURRENCY: '2', RESIDUAL_JOB: 'off' },
    });
    let out = '';
    server.stdout!.on('data', (chunk: Buffer) => (out += chunk.toString()));
    server.stderr!.on('data', (chunk: Buffer) => (out += chunk.toString()));
    const warmed = () => out.match(/\[bearline\] shortlist warmed up in \d+ ms \(\d+ elevation grids, one shortlist run\)/g) ?? [];
    try {
      // No request is sent until both workers have warmed up.
      for (const end = Date.now() + 100_000; warmed().length < 2 && Date.now() < end;) await sleep(200);
      expect(warmed(), out).toHaveLength(2);
      expect(out).toContain('2 workers listening');
      const health = await fetch(`http://127.0.0.1:${port}/api/health`);
      expect(health.status).toBe(200);
      // The first request finds the work started: it is not done again.
      await sleep(500);
      expect(warmed()).toHaveLength(2);
    } finally {
      server.kill('SIGTERM');
      await new Promise((r) => server.once('exit', r));
    }
  });
});
