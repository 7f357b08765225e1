// npm start: database → migrate → demo scenario when empty → build when changed → serve (restarted if it dies).
import { ensureDatabase } from './lib/database';
import { migrateLatest, withKnex } from './lib/migrate-runner';
import { removeOrphanSampleFiles } from '../src/lib/server/repos/elevation';
import { isDatabaseEmpty, runSeeds } from './lib/seed-runner';
import { buildIfChanged } from './lib/build';
import { startServer, waitForHttp } from './lib/server-process';
import { startMailCatcher } from './lib/mail-catcher';
import { supervise } from './lib/supervise';
import { DATA_DIR, HOST, PORT, SMTP_PORT, log } from './lib/project';

async function main() {
  const databaseUrl = await ensureDatabase();
  const applied = await migrateLatest(databaseUrl);
  log(applied.length ? `applied ${applied.length} migration(s)` : 'schema up to date');
  const orphans = await withKnex(databaseUrl, (knex) => removeOrphanSampleFiles(knex, DATA_DIR));
  if (orphans.length) log(`removed ${orphans.length} elevation samples file(s) no grid refers to`);
  if (await isDatabaseEmpty(databaseUrl)) {
    log('empty database: loading the demo scenario…');
    await runSeeds(databaseUrl);
  }
  buildIfChanged();
  const mailDir = `${DATA_DIR}/mail`;
  const smtpUrl = process.env.SMTP_URL ?? (await startMailCatcher({ port: SMTP_PORT, dir: mailDir }));
  // The server is restarted if it dies (scripts/lib/supervise.ts).
  const server = supervise(
    () => startServer({ host: HOST, port: PORT, env: { DATABASE_URL: databaseUrl, SMTP_URL: smtpUrl, DATA_DIR, MAIL_DIR: mailDir } }),
    log,
  );
  process.on('SIGINT', () => server.stop());
  process.on('SIGTERM', () => server.stop());
  server.done.then((code) => process.exit(code));
  await waitForHttp(`http://${HOST}:${PORT}/api/health`);
  log(`Bearline is running on http://${HOST}:${PORT}  (Ctrl+C stops the app; \`npm run stop\` stops the database)`);
}

main().catch((err) => {
  console.error(`[bearline] ${err instanceof Error ? err.message : err}`);
  process.exit(1);
});
