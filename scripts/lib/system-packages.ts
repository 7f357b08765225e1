// Installs the Debian packages Bearline needs when they are missing.
// PostgreSQL + PostGIS for the app, Chromium for the browser tests only.
import { execFileSync, spawnSync } from 'node:child_process';
import { existsSync, readdirSync } from 'node:fs';

const PG_ROOT = '/usr/lib/postgresql';

export function findPgBinDir(): string | null {
  if (!existsSync(PG_ROOT)) return null;
  const versions = readdirSync(PG_ROOT)
    .filter((v) => /^\d+$/.test(v) && existsSync(`${PG_ROOT}/${v}/bin/initdb`))
    .sort((a, b) => Number(b) - Number(a));
  return versions.length ? `${PG_ROOT}/${versions[0]}/bin` : null;
}

function hasPostgis(binDir: string): boolean {
  const version = binDir.split('/').at(-2);
  return existsSync(`/usr/share/postgresql/${version}/extension/postgis.control`);
}

let aptUpdated = false;
function aptInstall(packages: string[]): void {
  if (process.getuid && process.getuid() !== 0) {
    throw new Error(`Missing system packages: ${packages.join(' ')}. Install them with: sudo apt-get install -y ${packages.join(' ')}`);
  }
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
  if (!aptUpdated) {
    console.log('[setup] apt-get update');
    execFileSync('apt-get', ['update', '-qq'], { stdio: 'inherit', env });
    aptUpdated = true;
  }
  console.log(`[setup] apt-get install ${packages.join(' ')}`);
  execFileSync('apt-get', ['install', '-y', '-qq', '--no-install-recommends', ...packages], { stdio: 'inherit', env });
}

export function ensurePostgres(): string {
  let bin = findPgBinDir();
  if (!bin || !hasPostgis(bin)) {
    aptInstall(['postgresql', 'postgresql-15-postgis-3']);
    bin = findPgBinDir();
  }
  if (!bin || !hasPostgis(bin)) throw new Error('PostgreSQL with PostGIS could not be installed');
  return bin;
}

/** nginx from Debian (the light build: proxy and cache are all the scaling rehearsal needs). */
export function ensureNginx(): string {
  const bin = '/usr/sbin/nginx';
  if (!existsSync(bin)) aptInstall(['nginx-light']);
  if (!existsSync(bin)) throw new Error('nginx could not be installed');
  return bin;
}

export const CHROMIUM_PATH = '/usr/bin/chromium';

export function ensureChromium(): string {
  if (!existsSync(CHROMIUM_PATH)) aptInstall(['chromium']);
  const probe = spawnSync(CHROMIUM_PATH, ['--version'], { encoding: 'utf8' });
  if (probe.status !== 0) throw new Error(`Chromium at ${CHROMIUM_PATH} does not start: ${probe.stderr}`);
  return CHROMIUM_PATH;
}
