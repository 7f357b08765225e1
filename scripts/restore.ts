// npm run restore -- DIR [--force]: checks the backup's checksums, then replaces the database's
// tables and the files under DATA_DIR with it. Refuses to overwrite real data without --force.
import { restoreBackup } from './lib/backup';
import { ensureDatabase } from './lib/database';
import { assertOnlyDemoData } from './lib/demo-guard';
import { migrateLatest } from './lib/migrate-runner';
import { BACKUP_DIR, DATA_DIR, log } from './lib/project';

async function main() {
  const dir = process.argv.slice(2).find((a) => !a.startsWith('--'));
  if (!dir) throw new Error('usage: npm run restore -- <backup folder> [--force]');
  const url = await ensureDatabase();
  await assertOnlyDemoData(url, 'Restoring', process.argv.includes('--force'));
  const manifest = await restoreBackup({ dir, databaseUrl: url, dataDir: DATA_DIR, backupRoot: BACKUP_DIR });
  const applied = await migrateLatest(url);
  log(
    `restored the backup of ${manifest.created_at} (${manifest.files.length} files)${applied.length ? `, then applied ${applied.length} newer migration(s)` : ''}`,
  );
}

main().catch((err) => {
  console.error(`[bearline] ${err instanceof Error ? err.message : err}`);
  process.exit(1);
});
