// One Knex instance per app process.
import knexFactory, { type Knex } from 'knex';
import pg from 'pg';
import { config } from './config';

// bigint ids and counts come back as strings by default; numeric columns as numbers.
pg.types.setTypeParser(pg.types.builtins.NUMERIC, (v) => (v === null ? null : Number(v)));

// The app's statements are short and planned afresh each time (tiles, lists, one record): JIT
// compilation of their plans would cost more than it saves. Its tables are read from memory or
// solid-state storage, where a random page costs little more than a sequential one: PostgreSQL's
// manual suggests random_page_cost 1.1 for that (runtime-config-query, "Planner Cost Constants").
// With the default 4 the planner reads every mast, or every mast summary, for a tile that needs a
// thousand of them through their indexes.
const SESSION_OPTIONS = '-c jit=off -c random_page_cost=1.1';

let instance: Knex | null = null;

export function getDb(): Knex {
  if (!instance) {
    if (!config.databaseUrl) throw new Error('DATABASE_URL is not set');
    const { connectMs, statementMs } = config.dbTimeouts;
    instance = knexFactory({
      client: 'pg',
      connection: {
        connectionString: config.databaseUrl,
        // A database that accepts the TCP connection but never answers (frozen) fails here.
        connectionTimeoutMillis: connectMs,
        // The server cancels a statement after this; the client gives up a little later in case
        // the server itself is stuck. Long imports raise it with SET LOCAL statement_timeout.
        statement_timeout: statementMs,
        query_timeout: statementMs + 5_000,
        idle_in_transaction_session_timeout: statementMs * 2,
        keepAlive: true,
        options: SESSION_OPTIONS,
      },
      // Waiting for a free connection from the pool (all busy, or the database unreachable).
      acquireConnectionTimeout: connectMs + 2_000,
      pool: { min: 0, max: 10, createTimeoutMillis: connectMs + 1_000 },
    });
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
  if (!readInstance) {
    readInstance = knexFactory({ client: 'pg', connection: { connectionString: config.databaseReadUrl, options: SESSION_OPTIONS }, pool: { min: 0, max: 10 } });
  }
  return readInstance;
}

export type Tx = Knex | Knex.Transaction;
