// Resolves the database the app uses: DATABASE_URL when given, otherwise the
// project's own cluster in .data/pg (started on demand).
import { resolve } from 'node:path';
import { mkdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { canPgReach, startCluster, stopCluster, destroyCluster } from './pg-cluster';
import { PG_DIR, PG_PORT, log } from './project';

function clusterDir(): string {
  mkdirSync(PG_DIR, { recursive: true });
  if (canPgReach(PG_DIR)) return PG_DIR;
  // The postgres system user cannot enter the project folder (e.g. under /root):
  // keep the cluster in a per-project folder it can reach instead.
  const fallback = resolve(tmpdir(), `bearline-pg-${PG_PORT}`);
  log(`the postgres user cannot reach ${PG_DIR}; using ${fallback}`);
  return fallback;
}

export async function ensureDatabase(): Promise<string> {
  if (process.env.DATABASE_URL) return process.env.DATABASE_URL;
  const dir = clusterDir();
  log(`starting PostgreSQL on 127.0.0.1:${PG_PORT} (data in ${dir})`);
  return startCluster({ dir, port: PG_PORT });
}

export function stopDatabase(): void {
  if (process.env.DATABASE_URL) {
    log('DATABASE_URL is set: that server is not managed by Bearline, nothing to stop');
    return;
  }
  stopCluster(clusterDir());
}

export function destroyDatabase(): void {
  destroyCluster(clusterDir());
}
