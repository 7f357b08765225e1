// Backups: one folder per backup holding the database (pg_dump custom format), a copy of the
// files under DATA_DIR (elevation samples, uploads, mail), and manifest.json with the size and
// SHA-256 of each. Restore checks every checksum before it changes anything.
import { spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { copyFileSync, existsSync, mkdirSync, readFileSync, readdirSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { dirname, join, relative, resolve, sep } from 'node:path';
import { ensurePostgres } from './system-packages';
import { withKnex } from './migrate-runner';

export const MANIFEST = 'manifest.json';
export const DUMP_FILE = 'database.dump';
export const FILES_FOLDER = 'files';

export interface ManifestFile {
  path: string;
  bytes: number;
  sha256: string;
}

export interface Manifest {
  format: 'bearline-backup';
  version: 1;
  created_at: string;
  database: ManifestFile & { latest_migration: string | null };
  files: ManifestFile[];
}

function sha256File(path: string): string {
  return createHash('sha256').update(readFileSync(path)).digest('hex');
}

function describe(root: string, path: string): ManifestFile {
  const full = join(root, path);
  return { path, bytes: statSync(full).size, sha256: sha256File(full) };
}

/** Folders under DATA_DIR that are not application files: the database cluster and backups. */
function isSkipped(rel: string, skip: string[]): boolean {
  return skip.some((s) => rel === s || rel.startsWith(s + '/')) || rel.endsWith('.part');
}

function listDataFiles(dataDir: string, skip: string[]): string[] {
  if (!existsSync(dataDir)) return [];
  const out: string[] = [];
  const walk = (dir: string) => {
    for (const e of readdirSync(dir, { withFileTypes: true })) {
      const full = join(dir, e.name);
      const rel = relative(dataDir, full).split(sep).join('/');
      if (isSkipped(rel, skip)) continue;
      if (e.isDirectory()) walk(full);
      else if (e.isFile()) out.push(rel);
    }
  };
  walk(dataDir);
  return out.sort();
}

/** What DATA_DIR holds that is not application data: the project cluster, and backups kept inside it. */
export function skippedDataFolders(dataDir: string, backupRoot: string): string[] {
  const skip = ['pg'];
  const rel = relative(dataDir, backupRoot).split(sep).join('/');
  if (rel && !rel.startsWith('..')) skip.push(rel);
  return skip;
}

function run(bin: string, args: string[], what: string): void {
  const res = spawnSync(bin, args, { encoding: 'utf8', maxBuffer: 64 * 1024 * 1024 });
  if (res.status !== 0) throw new Error(`${what} failed: ${(res.stderr || res.stdout || String(res.error)).trim()}`);
}

export interface BackupOptions {
  databaseUrl: string;
  dataDir: string;
  /** Folder that receives the backup folder. */
  backupRoot: string;
  now?: Date;
}

export async function createBackup(opts: BackupOptions): Promise<{ dir: string; manifest: Manifest }> {
  const bin = ensurePostgres();
  const stamp = (opts.now ?? new Date())
    .toISOString()
    .replace(/[-:]/g, '')
    .replace(/\.\d+Z$/, 'Z');
  const dir = resolve(opts.backupRoot, `bearline-${stamp}`);
  if (existsSync(dir)) throw new Error(`${dir} exists already`);
  mkdirSync(dir, { recursive: true });
  try {
    run(`${bin}/pg_dump`, ['--format=custom', '--no-owner', '--no-privileges', `--file=${join(dir, DUMP_FILE)}`, opts.databaseUrl], 'pg_dump');
    const latest = await withKnex(opts.databaseUrl, async (knex) =>
      (await knex.schema.hasTable('knex_migrations')) ? ((await knex('knex_migrations').orderBy('id', 'desc').first('name'))?.name ?? null) : null,
    );
    const files = listDataFiles(opts.dataDir, skippedDataFolders(opts.dataDir, opts.backupRoot));
    for (const f of files) {
      const target = join(dir, FILES_FOLDER, f);
      mkdirSync(dirname(target), { recursive: true });
      copyFileSync(join(opts.dataDir, f), target);
    }
    const manifest: Manifest = {
      format: 'bearline-backup',
      version: 1,
      created_at: (opts.now ?? new Date()).toISOString(),
      database: { ...describe(dir, DUMP_FILE), latest_migration: latest },
      files: files.map((f) => describe(join(dir, FILES_FOLDER), f)),
    };
    writeFileSync(join(dir, MANIFEST), JSON.stringify(manifest, null, 2) + '\n');
    return { dir, manifest };
  } catch (err) {
    rmSync(dir, { recursive: true, force: true });
    throw err;
  }
}

/** Reads the manifest and checks every file against it; throws naming each problem. */
export function verifyBackup(dir: string): Manifest {
  const path = join(dir, MANIFEST);
  if (!existsSync(path)) throw new Error(`${dir} is not a Bearline backup (no ${MANIFEST})`);
  const manifest = JSON.parse(readFileSync(path, 'utf8')) as Manifest;
  if (manifest.format !== 'bearline-backup' || manifest.version !== 1) throw new Error(`${path}: unknown backup format`);
  const problems: string[] = [];
  const check = (root: string, f: ManifestFile) => {
    const full = join(root, f.path);
    if (!resolve(full).startsWith(resolve(root) + sep)) problems.push(`${f.path}: outside the backup`);
    else if (!existsSync(full)) problems.push(`${f.path}: missing`);
    else if (statSync(full).size !== f.bytes || sha256File(full) !== f.sha256) problems.push(`${f.path}: checksum does not match`);
  };
  check(dir, manifest.database);
  for (const f of manifest.files) check(join(dir, FILES_FOLDER), f);
  if (problems.length) throw new Error(`The backup in ${dir} is damaged; nothing was restored:\n  ${problems.join('\n  ')}`);
  return manifest;
}

export interface RestoreOptions {
  dir: string;
  databaseUrl: string;
  dataDir: string;
  backupRoot: string;
}

/**
 * Replaces the database's tables and the files under DATA_DIR with the backup's. Extensions
 * (PostGIS, pg_trgm) must exist in the target already: they belong to the database's owner.
 */
export async function restoreBackup(opts: RestoreOptions): Promise<Manifest> {
  const manifest = verifyBackup(opts.dir);
  const bin = ensurePostgres();
  const user = decodeURIComponent(new URL(opts.databaseUrl).username);
  // Only the objects the app's role owns: extensions and their tables are the server's.
  const list = spawnSync(`${bin}/pg_restore`, ['--list', join(opts.dir, DUMP_FILE)], { encoding: 'utf8', maxBuffer: 64 * 1024 * 1024 });
  if (list.status !== 0) throw new Error(`pg_restore --list failed: ${list.stderr.trim()}`);
  const keep = list.stdout.split('\n').filter((line) => /^\d+;/.test(line) && line.trim().split(/\s+/).pop() === user);
  const listFile = join(opts.dir, '.restore.list');
  const sqlFile = join(opts.dir, '.restore.sql');
  const dropFile = join(opts.dir, '.restore-drop.sql');
  writeFileSync(listFile, keep.join('\n') + '\n');
  writeFileSync(dropFile, 'DROP OWNED BY CURRENT_USER;\n');
  try {
    await withKnex(opts.databaseUrl, async (knex) => {
      const ext = await knex('pg_extension').whereIn('extname', ['postgis', 'pg_trgm']).pluck('extname');
      if (ext.length < 2) throw new Error('The target database needs the postgis and pg_trgm extensions (CREATE EXTENSION as a superuser)');
    });
    run(`${bin}/pg_restore`, ['--no-owner', '--no-privileges', `--use-list=${listFile}`, `--file=${sqlFile}`, join(opts.dir, DUMP_FILE)], 'pg_restore');
    // Dropping the old tables and loading the backup's is one transaction: a failure leaves the old data.
    run(
      `${bin}/psql`,
      ['--single-transaction', '--quiet', '--no-psqlrc', '-v', 'ON_ERROR_STOP=1', `--dbname=${opts.databaseUrl}`, '-f', dropFile, '-f', sqlFile],
      'restoring the database',
    );
  } finally {
    for (const f of [listFile, sqlFile, dropFile]) rmSync(f, { force: true });
  }
  const skip = skippedDataFolders(opts.dataDir, opts.backupRoot);
  for (const f of listDataFiles(opts.dataDir, skip)) rmSync(join(opts.dataDir, f), { force: true });
  for (const f of manifest.files) {
    const target = join(opts.dataDir, f.path);
    mkdirSync(dirname(target), { recursive: true });
    copyFileSync(join(opts.dir, FILES_FOLDER, f.path), target);
  }
  return manifest;
}
