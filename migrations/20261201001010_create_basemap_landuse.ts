import type { Knex } from 'knex';

// Basemap land cover (woods, farmland, moor, residential) for the 'landuse' tile layer.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('basemap_landuse', (t) => {
    t.bigIncrements('id').primary();
    t.text('name');
    t.text('kind').notNullable();
    t.specificType('geom', 'geometry(MultiPolygon, 4326)').notNullable();
  });
  await knex.raw('CREATE INDEX basemap_landuse_geom_idx ON basemap_landuse USING gist (geom)');
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('basemap_landuse');
}
