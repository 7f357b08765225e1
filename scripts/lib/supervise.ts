// Keeps the app server running: restarts it when it dies, waiting longer after each crash that
// comes soon after a start, and gives up when it keeps crashing at once (a broken build or
// configuration will not mend itself by restarting).
import type { ChildProcess } from 'node:child_process';

export interface RestartPolicy {
  /** A run shorter than this counts as a crash on start. */
  minUptimeMs: number;
  /** Give up after this many crashes on start in a row. */
  maxQuickCrashes: number;
  baseDelayMs: number;
  maxDelayMs: number;
}

export const DEFAULT_POLICY: RestartPolicy = { minUptimeMs: 10_000, maxQuickCrashes: 5, baseDelayMs: 1_000, maxDelayMs: 30_000 };

/** After a run of `uptimeMs` that followed `quickCrashes` crashes on start: wait, or give up. */
export function nextRestart(quickCrashes: number, uptimeMs: number, policy: RestartPolicy = DEFAULT_POLICY): { quickCrashes: number; delayMs: number | null } {
  const crashes = uptimeMs < policy.minUptimeMs ? quickCrashes + 1 : 0;
  if (crashes >= policy.maxQuickCrashes) return { quickCrashes: crashes, delayMs: null };
  return { quickCrashes: crashes, delayMs: Math.min(policy.maxDelayMs, policy.baseDelayMs * 2 ** crashes) };
}

export interface Supervisor {
  /** Stops the server (SIGTERM) without restarting it. */
  stop(): void;
  /** Resolves with the exit code to end with: 0 after stop(), 1 after giving up. */
  done: Promise<number>;
  /** How many times the server was started. */
  starts(): number;
}

export function supervise(start: () => ChildProcess, log: (msg: string) => void, policy: RestartPolicy = DEFAULT_POLICY): Supervisor {
  let child: ChildProcess | null = null;
  let stopping = false;
  let quickCrashes = 0;
  let count = 0;
  let timer: NodeJS.Timeout | null = null;
  let finish: (code: number) => void = () => undefined;
  const done = new Promise<number>((resolve) => (finish = resolve));

  const run = () => {
    timer = null;
    const startedAt = Date.now();
    count += 1;
    child = start();
    child.on('exit', (code, signal) => {
      child = null;
      if (stopping) return finish(0);
      const next = nextRestart(quickCrashes, Date.now() - startedAt, policy);
      quickCrashes = next.quickCrashes;
      const how = signal ? `signal ${signal}` : `code ${code}`;
      if (next.delayMs === null) {
        log(`the server stopped (${how}) ${quickCrashes} times right after starting; not restarting it. See the messages above.`);
        return finish(1);
      }
      log(`the server stopped (${how}); restarting in ${Math.round(next.delayMs / 1000)} s`);
      timer = setTimeout(run, next.delayMs);
    });
  };
  run();

  return {
    stop() {
      stopping = true;
      if (timer) {
        clearTimeout(timer);
        finish(0);
      }
      child?.kill('SIGTERM');
    },
    done,
    starts: () => count,
  };
}
