// Builds the app when its sources changed since the last build.
import { createHash } from 'node:crypto';
import { existsSync, readdirSync, readFileSync, statSync, writeFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { spawnSync } from 'node:child_process';
import { ROOT, log } from './project';
import { precompressDir } from './precompress';

const INPUTS = ['src', 'public', 'astro.config.mjs', 'tailwind.config.cjs', 'tsconfig.json', 'package-lock.json'];
const STAMP = resolve(ROOT, 'dist/.source-hash');

function walk(path: string, out: string[]): void {
  const st = statSync(path);
  if (st.isDirectory()) for (const name of readdirSync(path).sort()) walk(join(path, name), out);
  else out.push(path);
}

export function sourceHash(): string {
  const files: string[] = [];
  for (const input of INPUTS) {
    const p = resolve(ROOT, input);
    if (existsSync(p)) walk(p, files);
  }
  const h = createHash('sha256');
  for (const f of files) h.update(f).update(readFileSync(f));
  return h.digest('hex');
}

export function buildIfChanged(): void {
  const hash = sourceHash();
  if (existsSync(STAMP) && existsSync(resolve(ROOT, 'dist/server/entry.mjs')) && readFileSync(STAMP, 'utf8') === hash) {
    log('build is up to date');
    return;
  }
  log('building the app (astro build)…');
  const res = spawnSync('npx', ['astro', 'build'], { cwd: ROOT, stdio: 'inherit', env: { ...process.env, ASTRO_TELEMETRY_DISABLED: '1' } });
  if (res.status !== 0) throw new Error('astro build failed');
  precompressDir(resolve(ROOT, 'dist/client'));
  writeFileSync(STAMP, hash);
}
