import type { Knex } from 'knex';

// Operator names are unique (ignoring case), so two admins creating the same operator at once
// get one row and a 409. Names that already repeat get their MCC-MNC appended first.
export async function up(knex: Knex): Promise<void> {
  await knex.raw(`
    UPDATE operators o SET name = o.name || ' (' || o.mcc || '-' || o.mnc || ')'
    FROM (SELECT id, row_number() OVER (PARTITION BY lower(name) ORDER BY id) AS n FROM operators) d
    WHERE d.id = o.id AND d.n > 1`);
  await knex.raw('CREATE UNIQUE INDEX operators_name_unique ON operators (lower(name))');
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('DROP INDEX operators_name_unique');
}
