import type { Knex } from 'knex';

export async function up(knex: Knex): Promise<void> {
  await knex.raw('CREATE EXTENSION IF NOT EXISTS postgis');
  await knex.raw('CREATE EXTENSION IF NOT EXISTS pg_trgm');
}

// The extensions stay: other databases objects on the server may use them,
// and dropping PostGIS needs a superuser.
export async function down(): Promise<void> {}
