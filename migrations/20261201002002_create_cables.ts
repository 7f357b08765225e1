import type { Knex } from 'knex';

// Feeder cables in the team's catalogue. loss_table holds rows [{freq_mhz, loss_db_per_m}]
// sorted by frequency; connector_loss_db is per mated connector pair.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('cables', (t) => {
    t.bigIncrements('id').primary();
    t.text('name').notNullable();
    t.jsonb('loss_table').notNullable();
    t.double('connector_loss_db').notNullable().defaultTo(0.15);
    t.integer('connectors').notNullable().defaultTo(2);
    t.text('notes');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp('updated_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.check('connector_loss_db >= 0 AND connector_loss_db <= 3', [], 'cables_connector_loss_check');
    t.check('connectors BETWEEN 0 AND 10', [], 'cables_connectors_check');
    t.check("jsonb_typeof(loss_table) = 'array' AND jsonb_array_length(loss_table) >= 1", [], 'cables_loss_table_check');
  });
  await knex.raw('CREATE UNIQUE INDEX cables_name_lower_idx ON cables (lower(name))');
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('cables');
}
