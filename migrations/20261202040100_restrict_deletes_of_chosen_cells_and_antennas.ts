import type { Knex } from 'knex';

// A plan's chosen cell and a customer's current antenna are part of their history: deleting the
// cell or antenna must be refused, never clear them silently. The repos explain the refusal (409);
// these keys make the database refuse too.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('plans', (t) => {
    t.dropForeign(['cell_id']);
    t.foreign('cell_id').references('cells.id').onDelete('RESTRICT');
  });
  await knex.schema.alterTable('customers', (t) => {
    t.dropForeign(['current_antenna_id']);
    t.foreign('current_antenna_id').references('antennas.id').onDelete('RESTRICT');
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('customers', (t) => {
    t.dropForeign(['current_antenna_id']);
    t.foreign('current_antenna_id').references('antennas.id').onDelete('SET NULL');
  });
  await knex.schema.alterTable('plans', (t) => {
    t.dropForeign(['cell_id']);
    t.foreign('cell_id').references('cells.id').onDelete('SET NULL');
  });
}
