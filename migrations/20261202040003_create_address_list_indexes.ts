import type { Knex } from 'knex';

// The geocoder matches a typed postcode through this exact expression (spaces and dashes aside),
// OR-ed with the trigram test: with it indexed both halves use an index instead of a full scan.
// The admin list pages through the gazetteer by (label, id).
const POSTCODE_KEY_SQL = "regexp_replace(upper(coalesce(postcode, '')), '[^A-Z0-9]', '', 'g')";

export async function up(knex: Knex): Promise<void> {
  await knex.raw(`CREATE INDEX addresses_postcode_key_idx ON addresses ((${POSTCODE_KEY_SQL}))`);
  await knex.raw('CREATE INDEX addresses_label_id_idx ON addresses (label, id)');
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('DROP INDEX addresses_label_id_idx');
  await knex.raw('DROP INDEX addresses_postcode_key_idx');
}
