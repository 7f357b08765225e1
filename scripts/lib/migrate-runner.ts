// Runs the Knex migrations from migrations/ through an explicit migration source,
// so it works the same under tsx, vitest and the knex CLI.
import knexFactory, { type Knex } from 'knex';
import { readdirSync } from 'node:fs';
import { resolve } from 'node:path';
import { pathToFileURL } from 'node:url';

const MIGRATIONS_DIR = resolve(import.meta.dirname, '../../migrations');

interface MigrationModule {
  up: (knex: Knex) => Promise<void>;
  down: (knex: Knex) => Promise<void>;
  config?: { transaction?: boolean };
}

export const migrationSource: Knex.MigrationSource<string> = {
  async getMigrations() {
    return readdirSync(MIGRATIONS_DIR)
      .filter((f) => /^\d{14}_[a-z0-9_]+\.ts$/.test(f))
      .sort();
  },
  getMigrationName(name) {
    return name;
  },
  async getMigration(name) {
    return (await import(pathToFileURL(resolve(MIGRATIONS_DIR, name)).href)) as MigrationModule;
  },
};

export function connect(url: string): Knex {
  return knexFactory({ client: 'pg', connection: url, pool: { min: 0, max: 4 } });
}

export async function withKnex<T>(url: string, fn: (knex: Knex) => Promise<T>): Promise<T> {
  const knex = connect(url);
  try {
    return await fn(knex);
  } finally {
    await knex.destroy();
  }
}

export async function migrateLatest(url: string): Promise<string[]> {
  return withKnex(url, async (knex) => {
    const [, applied] = await knex.migrate.latest({ migrationSource });
    return applied as string[];
  });
}

export async function rollbackAll(url: string): Promise<void> {
  await withKnex(url, (knex) => knex.migrate.rollback({ migrationSource }, true));
}
