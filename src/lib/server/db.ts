// One Knex instance per app process.
import knexFactory, { type Knex } from 'knex';
import pg from 'pg';
import { config } from './config';

// bigint ids and counts come back as strings by default; numeric columns as numbers.
pg.types.setTypeParser(pg.types.builtins.NUMERIC, (v) => (v === null ? null : Number(v)));

let instance: Knex | null = null;

export function getDb(): Knex {
  if (!instance) {
    if (!config.databaseUrl) throw new Error('DATABASE_URL is not set');
    instance = knexFactory({ client: 'pg', connection: config.databaseUrl, pool: { min: 0, max: 10 } });
  }
  return instance;
}

let readInstance: Knex | null = null;

/**
 * The pool for reads that may lag a moment behind writes (tiles, the map list, the shortlist, address
 * search): a streaming-replication standby when DATABASE_READ_URL is set, otherwise the one database.
 * Anything that writes, or must see its own write at once, uses getDb().
 */
export function getReadDb(): Knex {
  if (!config.databaseReadUrl) return getDb();
  if (!readInstance) readInstance = knexFactory({ client: 'pg', connection: config.databaseReadUrl, pool: { min: 0, max: 10 } });
  return readInstance;
}

export type Tx = Knex | Knex.Transaction;
