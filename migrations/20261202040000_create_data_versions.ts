import type { Knex } from 'knex';

// A version per kind of shared data, renewed by every statement that writes it (from one sequence,
// so a version is never handed out twice, even after the table is emptied). Caches (the tile
// cache, the stored model residuals) key their entries by it, so a write anywhere — the app, an
// import, psql — makes the old entries unreachable without having to know which ones changed.
const WATCHED: Array<[table: string, name: string]> = [
  ['masts', 'masts'],
  ['cells', 'masts'],
  ['basemap_land', 'basemap'],
  ['basemap_landuse', 'basemap'],
  ['basemap_water', 'basemap'],
  ['basemap_roads', 'basemap'],
  ['basemap_places', 'basemap'],
  ['elevation_grids', 'elevation'],
];

export async function up(knex: Knex): Promise<void> {
  await knex.raw('CREATE SEQUENCE data_versions_seq');
  await knex.schema.createTable('data_versions', (t) => {
    t.text('name').primary();
    t.bigInteger('version').notNullable().defaultTo(knex.raw("nextval('data_versions_seq')"));
  });
  await knex('data_versions').insert([...new Set(WATCHED.map(([, name]) => name))].map((name) => ({ name })));
  await knex.raw(`
    CREATE FUNCTION bump_data_version() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      INSERT INTO data_versions (name) VALUES (TG_ARGV[0])
        ON CONFLICT (name) DO UPDATE SET version = nextval('data_versions_seq');
      RETURN NULL;
    END $$`);
  for (const [table, name] of WATCHED) {
    await knex.raw(
      `CREATE TRIGGER ${table}_bump_data_version AFTER INSERT OR UPDATE OR DELETE OR TRUNCATE ON ${table}
         FOR EACH STATEMENT EXECUTE FUNCTION bump_data_version('${name}')`,
    );
  }
}

export async function down(knex: Knex): Promise<void> {
  for (const [table] of WATCHED) await knex.raw(`DROP TRIGGER ${table}_bump_data_version ON ${table}`);
  await knex.raw('DROP FUNCTION bump_data_version()');
  await knex.schema.dropTable('data_versions');
  await knex.raw('DROP SEQUENCE data_versions_seq');
}
