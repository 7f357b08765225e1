import type { Knex } from 'knex';

// Sign-up and password-reset requests, kept in the database so that throttling holds across
// app servers. Counted per e-mail and per IP address over a sliding window.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('account_requests', (t) => {
    t.bigIncrements('id').primary();
    t.text('kind').notNullable();
    t.text('email').notNullable();
    t.text('ip').notNullable();
    t.timestamp('at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.check("kind IN ('signup','reset')", [], 'account_requests_kind_check');
    t.index(['kind', 'email', 'at']);
    t.index(['kind', 'ip', 'at']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('account_requests');
}
