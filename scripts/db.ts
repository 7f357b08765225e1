// npm run db:start | stop | db:reset
import { ensureDatabase, stopDatabase, destroyDatabase } from './lib/database';
import { migrateLatest } from './lib/migrate-runner';
import { runSeeds } from './lib/seed-runner';
import { log } from './lib/project';

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
