import type { Knex } from 'knex';

// Named areas a team serves (coverage reports, filters).
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('regions', (t) => {
    t.bigIncrements('id').primary();
    t.text('name').notNullable();
    t.specificType('geom', 'geometry(MultiPolygon, 4326)').notNullable();
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp('updated_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
  });
  await knex.raw('CREATE UNIQUE INDEX regions_name_lower_idx ON regions (lower(name))');
  await knex.raw('CREATE INDEX regions_geom_idx ON regions USING gist (geom)');
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('regions');
}
