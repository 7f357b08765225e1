// The scaling rehearsal on one machine, all on loopback: a PostgreSQL primary and a hot standby fed
// by streaming replication, two app instances (each reads through the standby, writes to the primary)
// and nginx in front of them, balancing, retrying an idempotent request on the other instance when
// one fails, and caching the public basemap tiles. Ports: SCALE_PORT_BASE (default 9163: five ports, clear of the benchmark's 9160–9162) and up.
import { spawnSync, type ChildProcess } from 'node:child_process';
import { chownSync, existsSync, mkdirSync, rmSync, writeFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { startCluster, databaseUrl } from './pg-cluster';
import { ensureNginx, ensurePostgres } from './system-packages';
import { migrateLatest } from './migrate-runner';
import { isDatabaseEmpty, runSeeds } from './seed-runner';
import { buildIfChanged } from './build';
import { startServer, waitForHttp } from './server-process';
import { DATA_DIR, log } from './project';

export interface ScaleDemoPorts {
  primary: number;
  standby: number;
  apps: [number, number];
  nginx: number;
}

export function scaleDemoPorts(base = Number(process.env.SCALE_PORT_BASE || 9163)): ScaleDemoPorts {
  return { primary: base, standby: base + 1, apps: [base + 2, base + 3], nginx: base + 4 };
}

export interface ScaleDemo {
  ports: ScaleDemoPorts;
  primaryUrl: string;
  standbyUrl: string;
  publicUrl: string;
  apps: ChildProcess[];
  /** Starts app instance `i` again (after a test stopped it). */
  restartApp(i: 0 | 1): Promise<void>;
  stop(): Promise<void>;
}

const REPLICATOR = 'replicator';
const REPLICATOR_PASSWORD = 'bearline-replica';
const isRoot = () => process.getuid?.() === 0;

function asPg(cmd: string, args: string[], env: Record<string, string> = {}): void {
  const res = isRoot()
    ? spawnSync('runuser', ['-u', 'postgres', '--', 'env', ...Object.entries(env).map(([k, v]) => `${k}=${v}`), cmd, ...args], { cwd: '/', encoding: 'utf8' })
    : spawnSync(cmd, args, { cwd: '/', encoding: 'utf8', env: { ...process.env, ...env } });
  if (res.status !== 0) throw new Error(`${cmd} ${args.join(' ')} failed:\n${res.stdout}\n${res.stderr}`);
}

function pgOwn(...paths: string[]): void {
  if (!isRoot()) return;
  const uid = Number(spawnSync('id', ['-u', 'postgres'], { encoding: 'utf8' }).stdout.trim());
  const gid = Number(spawnSync('id', ['-g', 'postgres'], { encoding: 'utf8' }).stdout.trim());
  for (const p of paths) chownSync(p, uid, gid);
}

/** The standby: a base backup of the primary with standby.signal and primary_conninfo (-R), started read-only. */
function startStandby(bin: string, dir: string, ports: ScaleDemoPorts): void {
  const data = join(dir, 'data');
  const run = join(dir, 'run');
  if (!existsSync(join(data, 'PG_VERSION'))) {
    rmSync(dir, { recursive: true, force: true });
    mkdirSync(run, { recursive: true });
    pgOwn(dir, run);
    asPg(`${bin}/pg_basebackup`, ['-h', '127.0.0.1', '-p', String(ports.primary), '-U', REPLICATOR, '-D', data, '-R', '-X', 'stream', '-c', 'fast'], {
      PGPASSWORD: REPLICATOR_PASSWORD,
    });
  }
  const log = join(dir, 'postgres.log');
  if (!existsSync(log)) {
    writeFileSync(log, '');
    pgOwn(log);
  }
  const running = spawnSync(
    isRoot() ? 'runuser' : `${bin}/pg_ctl`,
    isRoot() ? ['-u', 'postgres', '--', `${bin}/pg_ctl`, '-D', data, 'status'] : ['-D', data, 'status'],
    { cwd: '/' },
  );
  if (running.status === 0) return;
  asPg(`${bin}/pg_ctl`, [
    '-D',
    data,
    '-l',
    log,
    '-o',
    `-p ${ports.standby} -k ${run} -c listen_addresses=127.0.0.1 -c hot_standby=on`,
    '-w',
    '-t',
    '60',
    'start',
  ]);
}

function stopPg(bin: string, data: string): void {
  if (!existsSync(join(data, 'postmaster.pid'))) return;
  try {
    asPg(`${bin}/pg_ctl`, ['-D', data, '-m', 'fast', '-w', 'stop']);
  } catch {
    // already stopped
  }
}

function nginxConfig(dir: string, ports: ScaleDemoPorts): string {
  const user = isRoot() ? 'user www-data;' : '';
  return `${user}
worker_processes 2;
pid ${dir}/nginx.pid;
error_log ${dir}/nginx-error.log warn;
events { worker_connections 1024; }
http {
  access_log off;
  client_body_temp_path ${dir}/tmp/body;
  proxy_temp_path ${dir}/tmp/proxy;
  fastcgi_temp_path ${dir}/tmp/fastcgi;
  uwsgi_temp_path ${dir}/tmp/uwsgi;
  scgi_temp_path ${dir}/tmp/scgi;
  client_max_body_size 200m;
  # The public basemap tiles are the same for everyone: cached here for ten minutes. Mast tiles are
  # private (per signed-in user) and stay with the apps' own cache, keyed by the data version.
  proxy_cache_path ${dir}/cache levels=1:2 keys_zone=tiles:10m max_size=256m inactive=60m use_temp_path=off;
  upstream bearline {
    server 127.0.0.1:${ports.apps[0]} max_fails=1 fail_timeout=3s;
    server 127.0.0.1:${ports.apps[1]} max_fails=1 fail_timeout=3s;
    keepalive 32;
  }
  server {
    listen 127.0.0.1:${ports.nginx};
    proxy_http_version 1.1;
    proxy_set_header Connection "";
    proxy_set_header Host $http_host;
    proxy_set_header X-Forwarded-For $remote_addr;
    # A request that fails on one instance (refused, reset, 502/503) goes to the other; only
    # idempotent methods are retried, so a write is never sent twice.
    proxy_next_upstream error timeout http_502 http_503;
    proxy_next_upstream_tries 2;
    proxy_connect_timeout 2s;
    location /api/tiles/basemap/ {
      proxy_cache tiles;
      proxy_cache_valid 200 204 10m;
      proxy_cache_lock on;
      add_header X-Cache $upstream_cache_status;
      proxy_pass http://bearline;
    }
    location / {
      proxy_pass http://bearline;
    }
  }
}
`;
}

export async function startScaleDemo(options: { ports?: ScaleDemoPorts; dir?: string; quiet?: boolean } = {}): Promise<ScaleDemo> {
  const ports = options.ports ?? scaleDemoPorts();
  const dir = resolve(options.dir ?? join(DATA_DIR, 'scale'));
  mkdirSync(dir, { recursive: true });
  const bin = ensurePostgres();
  const nginx = ensureNginx();

  log(`primary PostgreSQL on 127.0.0.1:${ports.primary}`);
  const primaryUrl = await startCluster({ dir: join(dir, 'primary'), port: ports.primary, dbName: 'bearline' });
  const primaryRun = join(dir, 'primary', 'run');
  asPg(`${bin}/psql`, [
    '-h',
    primaryRun,
    '-p',
    String(ports.primary),
    '-U',
    'postgres',
    '-d',
    'postgres',
    '-qc',
    `DO $$ BEGIN IF NOT EXISTS (SELECT 1 FROM pg_roles WHERE rolname = '${REPLICATOR}') THEN CREATE ROLE ${REPLICATOR} REPLICATION LOGIN PASSWORD '${REPLICATOR_PASSWORD}'; END IF; END $$`,
  ]);
  await migrateLatest(primaryUrl);
  const dataDir = join(dir, 'data');
  if (await isDatabaseEmpty(primaryUrl)) {
    process.env.DATA_DIR = dataDir;
    await runSeeds(primaryUrl);
  }
  log(`hot standby on 127.0.0.1:${ports.standby} (streaming replication from the primary)`);
  startStandby(bin, join(dir, 'standby'), ports);
  const standbyUrl = databaseUrl({ dir, port: ports.standby, dbName: 'bearline' });

  buildIfChanged();
  const apps: ChildProcess[] = [];
  const startApp = async (i: 0 | 1) => {
    apps[i] = startServer({
      host: '127.0.0.1',
      port: ports.apps[i],
      stdio: options.quiet ? 'ignore' : 'inherit',
      env: {
        DATABASE_URL: primaryUrl,
        DATABASE_READ_URL: standbyUrl,
        DATA_DIR: dataDir,
        WEB_CONCURRENCY: '1',
        SMTP_URL: process.env.SMTP_URL ?? 'smtp://127.0.0.1:9',
      },
    });
    await waitForHttp(`http://127.0.0.1:${ports.apps[i]}/api/health`);
  };
  await Promise.all([startApp(0), startApp(1)]);

  for (const sub of ['tmp', 'cache']) mkdirSync(join(dir, 'nginx', sub), { recursive: true });
  const nginxDir = join(dir, 'nginx');
  if (isRoot()) spawnSync('chown', ['-R', 'www-data:www-data', nginxDir]);
  writeFileSync(join(nginxDir, 'nginx.conf'), nginxConfig(nginxDir, ports));
  if (existsSync(join(nginxDir, 'nginx.pid'))) spawnSync(nginx, ['-c', join(nginxDir, 'nginx.conf'), '-s', 'stop']);
  const started = spawnSync(nginx, ['-c', join(nginxDir, 'nginx.conf')], { encoding: 'utf8' });
  if (started.status !== 0) throw new Error(`nginx did not start: ${started.stderr}`);
  const publicUrl = `http://127.0.0.1:${ports.nginx}`;
  await waitForHttp(`${publicUrl}/api/health`);

  return {
    ports,
    primaryUrl,
    standbyUrl,
    publicUrl,
    apps,
    restartApp: startApp,
    async stop() {
      spawnSync(nginx, ['-c', join(nginxDir, 'nginx.conf'), '-s', 'stop']);
      for (const a of apps) a?.kill('SIGTERM');
      await new Promise((r) => setTimeout(r, 500));
      stopPg(bin, join(dir, 'standby', 'data'));
      stopPg(bin, join(dir, 'primary', 'data'));
    },
  };
}
