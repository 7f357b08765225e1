import type { Knex } from 'knex';

// Failed sign-ins, kept in the database so throttling holds across app servers.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('login_failures', (t) => {
    t.bigIncrements('id').primary();
    t.text('email').notNullable();
    t.text('ip').notNullable();
    t.timestamp('at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(['email', 'at']);
    t.index(['ip', 'at']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('login_failures');
}
