// npm start restarts a server that dies, backing off, and gives up on one that dies at once.
import { describe, expect, it } from 'vitest';
import { spawn } from 'node:child_process';
import { nextRestart, supervise, type RestartPolicy } from '../../scripts/lib/supervise';

const policy: RestartPolicy = { minUptimeMs: 1_000, maxQuickCrashes: 3, baseDelayMs: 50, maxDelayMs: 400 };

describe('restart policy', () => {
  it('backs off after crashes on start, and forgets them after a long run', () => {
    expect(nextRestart(0, 100, policy)).toEqual({ quickCrashes: 1, delayMs: 100 });
    expect(nextRestart(1, 100, policy)).toEqual({ quickCrashes: 2, delayMs: 200 });
    expect(nextRestart(2, 100, policy)).toEqual({ quickCrashes: 3, delayMs: null });
    expect(nextRestart(2, 60_000, policy)).toEqual({ quickCrashes: 0, delayMs: 50 });
    expect(nextRestart(0, 0, { ...policy, maxQuickCrashes: 99 }).delayMs).toBe(100);
    expect(nextRestart(8, 0, { ...policy, maxQuickCrashes: 99 }).delayMs).toBe(400);
  });
});

describe('supervise', () => {
  it('gives up on a server that crashes right after every start', async () => {
    const logs: string[] = [];
    // A generous minimum uptime: starting node is slow on a busy machine.
    const sup = supervise(
      () => spawn(process.execPath, ['-e', 'process.exit(3)'], { stdio: 'ignore' }),
      (m) => logs.push(m),
      { ...policy, minUptimeMs: 20_000 },
    );
    expect(await sup.done).toBe(1);
    expect(sup.starts()).toBe(3);
    expect(logs.at(-1)).toMatch(/not restarting/);
  });

  it('restarts a server that dies after running a while, and stops it on request', async () => {
    const logs: string[] = [];
    // Runs 1.2 s (longer than minUptimeMs), then crashes.
    const sup = supervise(
      () => spawn(process.execPath, ['-e', 'setTimeout(() => process.exit(1), 1200)'], { stdio: 'ignore' }),
      (m) => logs.push(m),
      policy,
    );
    while (sup.starts() < 3) await new Promise((r) => setTimeout(r, 100));
    sup.stop();
    expect(await sup.done).toBe(0);
    expect(logs.filter((l) => /restarting in/.test(l)).length).toBeGreaterThanOrEqual(2);
  });
});
