import type { Knex } from 'knex';

// When a customer's personal data was erased on their request (null while it is held).
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('customers', (t) => {
    t.timestamp('erased_at', { useTz: true });
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('customers', (t) => {
    t.dropColumn('erased_at');
  });
}
