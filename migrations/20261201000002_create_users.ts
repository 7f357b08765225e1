import type { Knex } from 'knex';

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('users', (t) => {
    t.bigIncrements('id').primary();
    t.text('email').notNullable();
    t.text('name').notNullable();
    t.text('role').notNullable();
    t.text('password_hash').notNullable();
    t.timestamp('disabled_at', { useTz: true });
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.check("role IN ('admin','planner','surveyor','reviewer','contributor')", [], 'users_role_check');
  });
  await knex.raw('CREATE UNIQUE INDEX users_email_lower_idx ON users (lower(email))');
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('users');
}
