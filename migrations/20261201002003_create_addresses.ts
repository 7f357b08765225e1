import type { Knex } from 'knex';

// The local gazetteer behind the geocoder. search_text (label + postcode) carries a
// trigram index for fuzzy matching and a tsvector for word search; match_key makes a
// re-imported address update its position instead of duplicating it.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('addresses', (t) => {
    t.bigIncrements('id').primary();
    t.text('label').notNullable();
    t.text('postcode');
    t.specificType('geom', 'geometry(Point, 4326)').notNullable();
    t.text('source').notNullable().defaultTo('import');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp('updated_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.check('length(label) BETWEEN 1 AND 300', [], 'addresses_label_check');
  });
  await knex.raw("ALTER TABLE addresses ADD COLUMN search_text text GENERATED ALWAYS AS (label || ' ' || coalesce(postcode, '')) STORED");
  await knex.raw(
    "ALTER TABLE addresses ADD COLUMN search_tsv tsvector GENERATED ALWAYS AS (to_tsvector('simple', label || ' ' || coalesce(postcode, ''))) STORED",
  );
  await knex.raw(
    "ALTER TABLE addresses ADD COLUMN match_key text GENERATED ALWAYS AS (lower(label) || '|' || coalesce(upper(replace(postcode, ' ', '')), '')) STORED",
  );
  await knex.raw('CREATE UNIQUE INDEX addresses_match_key_idx ON addresses (match_key)');
  await knex.raw('CREATE INDEX addresses_search_trgm_idx ON addresses USING gin (search_text gin_trgm_ops)');
  await knex.raw('CREATE INDEX addresses_search_tsv_idx ON addresses USING gin (search_tsv)');
  await knex.raw('CREATE INDEX addresses_geom_idx ON addresses USING gist (geom)');
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('addresses');
}
