import { describe, expect, it } from 'vitest';
import { migrateLatest, rollbackAll, withKnex } from '../../scripts/lib/migrate-runner';

const url = process.env.DATABASE_URL!;

async function tables(): Promise<string[]> {
  return withKnex(url, async (k) => {
    const { rows } = await k.raw<{ rows: { tablename: string }[] }>(
      "SELECT tablename FROM pg_tables WHERE schemaname='public' AND tablename NOT LIKE 'knex_%' AND tablename <> 'spatial_ref_sys' ORDER BY 1",
    );
    return rows.map((r) => r.tablename);
  });
}

describe('migrations', () => {
  it('go up, all the way down, and up again to the same schema', async () => {
    await migrateLatest(url);
    const before = await tables();
    expect(before).toEqual(expect.arrayContaining(['users', 'sessions', 'audit_log']));
    await rollbackAll(url);
    expect(await tables()).toEqual([]);
    await migrateLatest(url);
    expect(await tables()).toEqual(before);
  });
});
