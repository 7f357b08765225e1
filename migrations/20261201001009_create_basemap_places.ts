import type { Knex } from 'knex';

// Basemap named places (towns, villages, hamlets, peaks, islands) for labels and search.
// rank orders labels: 1 is the most important.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('basemap_places', (t) => {
    t.bigIncrements('id').primary();
    t.text('name').notNullable();
    t.text('kind').notNullable();
    t.integer('rank').notNullable().defaultTo(5);
    t.integer('population');
    t.double('ele_m');
    t.specificType('geom', 'geometry(Point, 4326)').notNullable();
  });
  await knex.raw('CREATE INDEX basemap_places_geom_idx ON basemap_places USING gist (geom)');
  await knex.raw('CREATE INDEX basemap_places_name_trgm_idx ON basemap_places USING gin (name gin_trgm_ops)');
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('basemap_places');
}
