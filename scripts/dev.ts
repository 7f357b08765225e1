// npm run dev: the project database, then Astro's dev server against it (hot reload).
import { spawn } from 'node:child_process';
import { ensureDatabase } from './lib/database';
import { migrateLatest } from './lib/migrate-runner';
import { isDatabaseEmpty, runSeeds } from './lib/seed-runner';
import { DATA_DIR, HOST, PORT, ROOT, log } from './lib/project';

async function main() {
  const databaseUrl = await ensureDatabase();
  await migrateLatest(databaseUrl);
  if (await isDatabaseEmpty(databaseUrl)) {
    log('empty database: loading the demo scenario…');
    await runSeeds(databaseUrl);
  }
  const dev = spawn('npx', ['astro', 'dev', '--host', HOST, '--port', String(PORT)], {
    cwd: ROOT,
    stdio: 'inherit',
    env: { ...process.env, DATABASE_URL: databaseUrl, DATA_DIR, ASTRO_TELEMETRY_DISABLED: '1' },
  });
  dev.on('exit', (code) => process.exit(code ?? 0));
}

main().catch((err) => {
  console.error(`[bearline] ${err instanceof Error ? err.message : err}`);
  process.exit(1);
});
