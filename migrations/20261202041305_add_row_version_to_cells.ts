import type { Knex } from 'knex';

// Cells get optimistic concurrency like masts: a PATCH names the row_version it read, and a
// stale one is refused (409) instead of silently overwriting a parallel edit.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('cells', (t) => {
    t.integer('row_version').notNullable().defaultTo(1);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('cells', (t) => {
    t.dropColumn('row_version');
  });
}
