import type { Knex } from 'knex';

// Mobile network operators, identified by MCC + MNC. The colour is chosen by an admin
// (defaults come from a colour-blind-safe palette) and is used for mast symbols.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('operators', (t) => {
    t.bigIncrements('id').primary();
    t.text('name').notNullable();
    t.text('mcc').notNullable();
    t.text('mnc').notNullable();
    t.text('colour').notNullable();
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp('updated_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.unique(['mcc', 'mnc'], { indexName: 'operators_mcc_mnc_unique' });
    t.check("mcc ~ '^[0-9]{3}$'", [], 'operators_mcc_check');
    t.check("mnc ~ '^[0-9]{2,3}$'", [], 'operators_mnc_check');
    t.check("colour ~ '^#[0-9a-f]{6}$'", [], 'operators_colour_check');
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('operators');
}
