// npm run migrate [-- down]: applies (or rolls back) the Knex migrations.
import { ensureDatabase } from './lib/database';
import { migrateLatest, rollbackAll } from './lib/migrate-runner';
import { log } from './lib/project';

async function main() {
  const url = await ensureDatabase();
  if (process.argv[2] === 'down') {
    await rollbackAll(url);
    log('all migrations rolled back');
  } else {
    const applied = await migrateLatest(url);
    log(applied.length ? `applied ${applied.join(', ')}` : 'schema up to date');
  }
}

main().catch((err) => {
  console.error(`[bearline] ${err instanceof Error ? err.message : err}`);
  process.exit(1);
});
