import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import autocannon from 'autocannon';
import knexFactory, { type Knex } from 'knex';
import { startScaleDemo, type ScaleDemo } from '../../scripts/lib/scale-demo';

// The rehearsal of item "beyond one machine": nginx in front of two app instances, reads from a
// streaming-replication standby. Runs with `npm run test:scale` (a few minutes), not in `npm test`.
let demo: ScaleDemo;
let standby: Knex;
let cookie = '';

async function login(base: string, email: string): Promise<string> {
  const res = await fetch(`${base}/api/auth/login`, {
    method: 'POST',
    headers: { 'Content-Type': 'application/json', Origin: base },
    body: JSON.stringify({ email, password: 'bearline-demo' }),
  });
  expect(res.status).toBe(200);
  return res.headers
    .getSetCookie()
    .map((c) => c.split(';')[0])
    .join('; ');
}

beforeAll(async () => {
  demo = await startScaleDemo({ quiet: true });
  standby = knexFactory({ client: 'pg', connection: demo.standbyUrl, pool: { min: 0, max: 2 } });
  cookie = await login(demo.publicUrl, 'admin@demo.bearline.test');
});

afterAll(async () => {
  await standby?.destroy();
  await demo?.stop();
});

describe('scaling rehearsal', () => {
  it('the standby is a read-only replica of the primary', async () => {
    const { rows } = await standby.raw('SELECT pg_is_in_recovery() AS standby');
    expect(rows[0].standby).toBe(true);
    await expect(standby.raw("INSERT INTO operators (name, mcc, mnc, colour) VALUES ('x', '001', '99', '#000000')")).rejects.toThrow(/read-only/);
  });

  it('loses no request when one app instance is killed under load', async () => {
    const paths = [
      '/api/health',
      '/api/masts?bbox=-129,-48,-127,-46',
      '/api/tiles/masts/9/73/316.mvt',
      '/api/tiles/basemap/9/73/316.mvt',
      '/map',
      '/api/operators',
    ];
    let n = 0;
    const run = autocannon({
      url: demo.publicUrl,
      connections: 10,
      duration: 12,
      headers: { Cookie: cookie },
      requests: [{ setupRequest: (req) => ({ ...req, path: paths[n++ % paths.length] }) }],
    });
    await new Promise((r) => setTimeout(r, 4000));
    const victim = demo.apps[0]!;
    victim.kill('SIGKILL');
    const result = await run;
    expect(victim.exitCode !== null || victim.signalCode !== null).toBe(true);
    expect(result.errors).toBe(0);
    expect(result.timeouts).toBe(0);
    expect(result.non2xx).toBe(0);
    // Requests ran before and after the kill (a handful a second even on a busy two-core machine).
    expect(result.requests.total).toBeGreaterThan(10);
    await demo.restartApp(0);
  });

  it('shows a write through nginx on the standby within a second', async () => {
    const name = `Replica check ${Date.now()}`;
    const res = await fetch(`${demo.publicUrl}/api/masts`, {
      method: 'POST',
      headers: { 'Content-Type': 'application/json', Origin: demo.publicUrl, Cookie: cookie },
      body: JSON.stringify({ name, lat: -47.3, lon: -128.4 }),
    });
    expect(res.status).toBe(201);
    const written = Date.now();
    // When the standby began the statement that first found the row (its snapshot), on the same
    // clock: the poll's own trip back to the test is no part of the replication delay.
    let seenAfter = Infinity;
    while (Date.now() - written < 5000) {
      const { rows } = await standby.raw<{ rows: Array<{ at: number }> }>(
        'SELECT extract(epoch FROM statement_timestamp()) * 1000 AS at FROM masts WHERE name = ?',
        [name],
      );
      if (rows[0]) {
        seenAfter = Number(rows[0].at) - written;
        break;
      }
      await new Promise((r) => setTimeout(r, 10));
    }
    expect(seenAfter).toBeLessThan(1000);
    // And the app reads it back through the standby (the mast list reads there).
    const list = await fetch(`${demo.publicUrl}/api/masts?bbox=-128.5,-47.4,-128.3,-47.2`, { headers: { Cookie: cookie } });
    const body = (await list.json()) as { features: Array<{ properties: { name: string } }> };
    expect(body.features.map((f) => f.properties.name)).toContain(name);
  });
});
