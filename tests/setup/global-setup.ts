// Migrates the test database once before the integration tests.
// scripts/test.ts starts the throwaway cluster and sets DATABASE_URL; a bare
// `npx vitest run tests/domain` works without a database.
export default async function setup() {
  if (!process.env.DATABASE_URL) return;
  const { migrateLatest } = await import('../../scripts/lib/migrate-runner');
  await migrateLatest(process.env.DATABASE_URL);
}
