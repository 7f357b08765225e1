// npm run db:start | stop | db:reset [-- --force]
import { ensureDatabase, stopDatabase, destroyDatabase } from './lib/database';
import { migrateLatest } from './lib/migrate-runner';
import { runSeeds } from './lib/seed-runner';
import { BACKUP_DIR, DATA_DIR, log } from './lib/project';
import { assertOnlyDemoData, findNonDemoData } from './lib/demo-guard';
import { createBackup } from './lib/backup';

const command = process.argv[2];

async function main() {
  switch (command) {
    case 'start': {
      const url = await ensureDatabase();
      log(`database ready: ${url.replace(/:[^:@/]+@/, ':***@')}`);
      break;
    }
    case 'stop':
      stopDatabase();
      log('database stopped');
      break;
    case 'reset': {
      if (process.env.DATABASE_URL) throw new Error('db:reset only resets the project database; unset DATABASE_URL');
      const before = await ensureDatabase();
      await assertOnlyDemoData(before, 'db:reset', process.argv.includes('--force'));
      if ((await findNonDemoData(before)).length) {
        const { dir } = await createBackup({ databaseUrl: before, dataDir: DATA_DIR, backupRoot: BACKUP_DIR });
        log(`backup of the old data written to ${dir}`);
      }
      destroyDatabase();
      const url = await ensureDatabase();
      const applied = await migrateLatest(url);
      log(`migrated (${applied.length} migrations)`);
      const seeds = await runSeeds(url);
      log(`demo scenario loaded (${seeds.join(', ')})`);
      break;
    }
    default:
      throw new Error(`unknown command "${command}" (start, stop, reset)`);
  }
}

main().catch((err) => {
  console.error(`[bearline] ${err instanceof Error ? err.message : err}`);
  process.exit(1);
});
