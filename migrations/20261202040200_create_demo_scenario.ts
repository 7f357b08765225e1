import type { Knex } from 'knex';

// Marks a database whose data was loaded by the demo seeds, and when. The seed and reset scripts
// only wipe a database that holds the demo scenario and nothing else (see scripts/lib/demo-guard.ts).
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('demo_scenario', (t) => {
    t.integer('id').primary();
    t.timestamp('loaded_at', { useTz: true }).notNullable();
    t.check('id = 1', [], 'demo_scenario_single_row_check');
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('demo_scenario');
}
