// npm run backup [-- --to DIR]: the database (pg_dump) and the files under DATA_DIR into one
// folder with a manifest of sizes and SHA-256 checksums. Prints the folder.
import { createBackup } from './lib/backup';
import { ensureDatabase } from './lib/database';
import { BACKUP_DIR, DATA_DIR, log } from './lib/project';

function option(name: string): string | undefined {
  const i = process.argv.indexOf(name);
  return i >= 0 ? process.argv[i + 1] : undefined;
}

async function main() {
  const url = await ensureDatabase();
  const { dir, manifest } = await createBackup({ databaseUrl: url, dataDir: DATA_DIR, backupRoot: option('--to') ?? BACKUP_DIR });
  const bytes = manifest.database.bytes + manifest.files.reduce((n, f) => n + f.bytes, 0);
  log(`backup written to ${dir} (${manifest.files.length} files, ${(bytes / 1e6).toFixed(1)} MB)`);
}

main().catch((err) => {
  console.error(`[bearline] ${err instanceof Error ? err.message : err}`);
  process.exit(1);
});
