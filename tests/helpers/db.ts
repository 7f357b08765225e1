// Integration-test database helpers: one Knex for the test database, truncation between tests.
import type { Knex } from 'knex';
import { getDb } from '../../src/lib/server/db';

export function testDb(): Knex {
  if (!process.env.DATABASE_URL) throw new Error('Integration tests need DATABASE_URL (run them through `npm test`)');
  return getDb();
}

/** Empties every application table (keeps the migration bookkeeping and PostGIS tables). */
export async function truncateAll(): Promise<void> {
  const db = testDb();
  const { rows } = await db.raw<{ rows: { tablename: string }[] }>(
    `SELECT tablename FROM pg_tables WHERE schemaname = 'public'
       AND tablename NOT LIKE 'knex_%' AND tablename <> 'spatial_ref_sys'`,
  );
  if (!rows.length) return;
  const sql = `TRUNCATE ${rows.map((r) => `"${r.tablename}"`).join(', ')} RESTART IDENTITY CASCADE`;
  // A background job of the app under test (the signal map's sweep, the job queue) may hold locks on
  // some of these tables. PostgreSQL breaks a deadlock it sees (40P01); one that runs through the
  // client it cannot see (a job's transaction awaiting its own progress update, queued behind this
  // TRUNCATE), so the TRUNCATE gives up its place after a short lock wait (55P03) and tries again.
  for (let attempt = 1; ; attempt++) {
    try {
      await db.transaction(async (trx) => {
        await trx.raw(`SET LOCAL lock_timeout = '2s'`);
        await trx.raw(sql);
      });
      return;
    } catch (err) {
      const code = (err as { code?: string }).code;
      if (!(code === '40P01' || code === '55P03') || attempt >= 15) throw err;
      await new Promise((resolve) => setTimeout(resolve, 100 * attempt));
    }
  }
}

/** The row_version a row has now (1 when there is no such row), for PATCH bodies in tests. */
export async function currentRowVersion(table: 'plans' | 'customers' | 'cells' | 'masts', id: string): Promise<number> {
  if (!/^\d+$/.test(id)) return 1;
  const row = await testDb()(table).where({ id }).first('row_version');
  return row ? Number(row.row_version) : 1;
}
