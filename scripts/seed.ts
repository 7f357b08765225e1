// npm run seed [-- --force]: (re)loads the demo scenario. Each seed clears its own tables first,
// so it refuses a database that holds anything but the demo scenario unless --force is given.
import { ensureDatabase } from './lib/database';
import { migrateLatest } from './lib/migrate-runner';
import { runSeeds } from './lib/seed-runner';
import { log } from './lib/project';
import { assertOnlyDemoData } from './lib/demo-guard';

async function main() {
  const url = await ensureDatabase();
  await migrateLatest(url);
  await assertOnlyDemoData(url, 'Seeding the demo scenario', process.argv.includes('--force'));
  const files = await runSeeds(url);
  log(`seeded: ${files.join(', ')}`);
}

main().catch((err) => {
  console.error(`[bearline] ${err instanceof Error ? err.message : err}`);
  process.exit(1);
});
