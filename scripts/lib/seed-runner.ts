// Runs the seed files in seeds/ in name order, each inside its own transaction.
import type { Knex } from 'knex';
import { readdirSync } from 'node:fs';
import { resolve } from 'node:path';
import { pathToFileURL } from 'node:url';
import { withKnex } from './migrate-runner';

const SEEDS_DIR = resolve(import.meta.dirname, '../../seeds');

export async function runSeeds(url: string): Promise<string[]> {
  const files = readdirSync(SEEDS_DIR)
    .filter((f) => /^\d{2}_[a-z0-9_]+\.ts$/.test(f))
    .sort();
  await withKnex(url, async (knex) => {
    for (const file of files) {
      const mod = (await import(pathToFileURL(resolve(SEEDS_DIR, file)).href)) as { seed: (k: Knex) => Promise<void> };
      await knex.transaction((trx) => mod.seed(trx));
    }
  });
  return files;
}

export async function isDatabaseEmpty(url: string): Promise<boolean> {
  return withKnex(url, async (knex) => {
    const row = await knex('users').count<{ count: string }[]>('* as count').first();
    return Number(row?.count ?? 0) === 0;
  });
}
