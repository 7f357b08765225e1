import type { Knex } from 'knex';

// Speed tests run during an install check.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('install_check_speed_tests', (t) => {
    t.bigIncrements('id').primary();
    t.bigInteger('check_id').notNullable().references('install_checks.id').onDelete('CASCADE');
    t.double('down_mbps').notNullable();
    t.double('up_mbps').notNullable();
    t.double('latency_ms');
    t.check('down_mbps >= 0 AND up_mbps >= 0', [], 'install_check_speed_tests_rates_check');
    t.index(['check_id']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('install_check_speed_tests');
}
