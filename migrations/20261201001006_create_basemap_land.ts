import type { Knex } from 'knex';

// Basemap land areas (islands), served as the 'land' layer of the basemap tiles.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('basemap_land', (t) => {
    t.bigIncrements('id').primary();
    t.text('name');
    t.text('kind').notNullable();
    t.specificType('geom', 'geometry(MultiPolygon, 4326)').notNullable();
  });
  await knex.raw('CREATE INDEX basemap_land_geom_idx ON basemap_land USING gist (geom)');
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('basemap_land');
}
