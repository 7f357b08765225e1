// Starts the built app (server/serve.mjs: dist/ on every core, compressed) and waits until it answers.
import { spawn, type ChildProcess } from 'node:child_process';
import { resolve } from 'node:path';
import { ROOT } from './project';

export interface ServerOptions {
  host: string;
  port: number;
  env: Record<string, string>;
  stdio?: 'inherit' | 'ignore' | 'pipe';
  /** Build folder (default dist). */
  distDir?: string;
}

export function startServer(opts: ServerOptions): ChildProcess {
  return spawn(process.execPath, [resolve(ROOT, 'server/serve.mjs')], {
    cwd: ROOT,
    stdio: opts.stdio ?? 'inherit',
    env: {
      ...process.env,
      ...opts.env,
      BEARLINE_DIST: resolve(ROOT, opts.distDir ?? process.env.BEARLINE_DIST ?? 'dist'),
      HOST: opts.host,
      PORT: String(opts.port),
      ASTRO_TELEMETRY_DISABLED: '1',
    },
  });
}

export async function waitForHttp(url: string, timeoutMs = 60_000): Promise<void> {
  const until = Date.now() + timeoutMs;
  let last = '';
  while (Date.now() < until) {
    try {
      const res = await fetch(url);
      if (res.status < 500) return;
      last = `HTTP ${res.status}`;
    } catch (err) {
      last = err instanceof Error ? err.message : String(err);
    }
    await new Promise((r) => setTimeout(r, 300));
  }
  throw new Error(`${url} did not answer within ${timeoutMs / 1000}s (${last})`);
}
