import type { Knex } from 'knex';

// Before/after checks at an install: one row per visit phase; readings per PCI and
// speed tests hang off it.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('install_checks', (t) => {
    t.bigIncrements('id').primary();
    t.bigInteger('plan_id').notNullable().references('plans.id').onDelete('CASCADE');
    t.text('phase').notNullable();
    t.timestamp('taken_at', { useTz: true }).notNullable();
    t.text('notes');
    t.bigInteger('created_by').references('users.id').onDelete('SET NULL');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.check("phase IN ('before','after')", [], 'install_checks_phase_check');
    t.index(['plan_id', 'phase', 'taken_at']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('install_checks');
}
