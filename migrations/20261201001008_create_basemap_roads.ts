import type { Knex } from 'knex';

// Basemap road centrelines ('roads' tile layer); kind is the road class.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('basemap_roads', (t) => {
    t.bigIncrements('id').primary();
    t.text('name');
    t.text('kind').notNullable();
    t.text('ref');
    t.specificType('geom', 'geometry(LineString, 4326)').notNullable();
  });
  await knex.raw('CREATE INDEX basemap_roads_geom_idx ON basemap_roads USING gist (geom)');
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('basemap_roads');
}
