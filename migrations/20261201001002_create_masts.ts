import type { Knex } from 'knex';

// Physical structures carrying cells. row_version backs optimistic concurrency on edits.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('masts', (t) => {
    t.bigIncrements('id').primary();
    t.text('name').notNullable();
    t.text('reference');
    t.specificType('geom', 'geometry(Point, 4326)').notNullable();
    t.double('ground_elevation_m');
    t.double('structure_height_m');
    t.text('structure_type').notNullable().defaultTo('other');
    t.text('status').notNullable().defaultTo('active');
    t.text('access_notes');
    t.text('source').notNullable().defaultTo('manual');
    t.bigInteger('created_by').references('users.id').onDelete('SET NULL');
    t.bigInteger('updated_by').references('users.id').onDelete('SET NULL');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp('updated_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.integer('row_version').notNullable().defaultTo(1);
    t.check("status IN ('active','planned','decommissioned')", [], 'masts_status_check');
    t.check("structure_type IN ('lattice_tower','monopole','guyed_mast','rooftop','pole','water_tower','other')", [], 'masts_structure_type_check');
    t.index(['status']);
  });
  await knex.raw('CREATE INDEX masts_geom_idx ON masts USING gist (geom)');
  await knex.raw('CREATE UNIQUE INDEX masts_reference_lower_idx ON masts (lower(reference)) WHERE reference IS NOT NULL');
  await knex.raw('CREATE INDEX masts_name_trgm_idx ON masts USING gin (name gin_trgm_ops)');
  await knex.raw('CREATE INDEX masts_reference_trgm_idx ON masts USING gin (reference gin_trgm_ops)');
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('masts');
}
