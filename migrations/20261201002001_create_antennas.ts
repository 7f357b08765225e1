import type { Knex } from 'knex';

// Customer-side antennas in the team's catalogue. gain_table holds rows
// [{freq_mhz, gain_dbi}] sorted by frequency; the shortlist interpolates linearly
// between them. Shape and ranges are checked by the zod schema.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('antennas', (t) => {
    t.bigIncrements('id').primary();
    t.text('name').notNullable();
    t.text('kind').notNullable();
    t.integer('ports').notNullable().defaultTo(1);
    t.double('horizontal_beamwidth_deg').notNullable();
    t.jsonb('gain_table').notNullable();
    t.text('notes');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp('updated_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.check("kind IN ('directional','omni','stub')", [], 'antennas_kind_check');
    t.check('ports BETWEEN 1 AND 8', [], 'antennas_ports_check');
    t.check('horizontal_beamwidth_deg > 0 AND horizontal_beamwidth_deg <= 360', [], 'antennas_beamwidth_check');
    t.check("jsonb_typeof(gain_table) = 'array' AND jsonb_array_length(gain_table) >= 1", [], 'antennas_gain_table_check');
  });
  await knex.raw('CREATE UNIQUE INDEX antennas_name_lower_idx ON antennas (lower(name))');
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('antennas');
}
