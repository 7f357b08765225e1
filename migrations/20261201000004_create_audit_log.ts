import type { Knex } from 'knex';

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('audit_log', (t) => {
    t.bigIncrements('id').primary();
    t.bigInteger('user_id').references('users.id').onDelete('SET NULL');
    t.timestamp('at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.text('action').notNullable();
    t.text('entity').notNullable();
    t.text('entity_id');
    t.jsonb('before');
    t.jsonb('after');
    t.index(['entity', 'entity_id']);
    t.index(['at']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('audit_log');
}
