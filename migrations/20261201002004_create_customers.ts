import type { Knex } from 'knex';

// Customers of the install team: contact, address and position, and what they use today
// (operator and antenna) so a plan can state the expected improvement.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('customers', (t) => {
    t.bigIncrements('id').primary();
    t.text('name').notNullable();
    t.text('phone');
    t.text('email');
    t.text('address_label').notNullable();
    t.text('postcode');
    t.specificType('geom', 'geometry(Point, 4326)').notNullable();
    t.bigInteger('current_operator_id').references('operators.id').onDelete('SET NULL');
    t.bigInteger('current_antenna_id').references('antennas.id').onDelete('SET NULL');
    t.text('notes');
    t.bigInteger('created_by').references('users.id').onDelete('SET NULL');
    t.bigInteger('updated_by').references('users.id').onDelete('SET NULL');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp('updated_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.integer('row_version').notNullable().defaultTo(1);
  });
  await knex.raw('CREATE INDEX customers_geom_idx ON customers USING gist (geom)');
  await knex.raw(
    "CREATE INDEX customers_search_trgm_idx ON customers USING gin ((name || ' ' || address_label || ' ' || coalesce(postcode, '')) gin_trgm_ops)",
  );
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('customers');
}
