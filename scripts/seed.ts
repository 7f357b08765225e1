// npm run seed: (re)loads the demo scenario. Each seed clears its own tables first.
import { ensureDatabase } from './lib/database';
import { migrateLatest } from './lib/migrate-runner';
import { runSeeds } from './lib/seed-runner';
import { log } from './lib/project';

async function main() {
  const url = await ensureDatabase();
  await migrateLatest(url);
  const files = await runSeeds(url);
  log(`seeded: ${files.join(', ')}`);
}

main().catch((err) => {
  console.error(`[bearline] ${err instanceof Error ? err.message : err}`);
  process.exit(1);
});
