import type { Knex } from 'knex';

// The signal-hexes job replaces the hexagons of one level around a changed area: found by level,
// column and row, without reading the whole level.
export async function up(knex: Knex): Promise<void> {
  await knex.raw('CREATE INDEX reading_hexes_position_idx ON reading_hexes (level, i, j)');
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('DROP INDEX reading_hexes_position_idx');
}
