import type { Knex } from 'knex';

// Basemap inland water: lakes as polygons and rivers/streams as lines ('water' tile layer).
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('basemap_water', (t) => {
    t.bigIncrements('id').primary();
    t.text('name');
    t.text('kind').notNullable();
    t.specificType('geom', 'geometry(Geometry, 4326)').notNullable();
  });
  await knex.raw('CREATE INDEX basemap_water_geom_idx ON basemap_water USING gist (geom)');
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('basemap_water');
}
