import type { Knex } from 'knex';

// Field reports of a mast, pending review. The position is geography so that distances to
// existing masts come out in metres. client_uuid is made by the submitting device, so a
// retried upload finds the first sighting instead of creating a second one. A decision fills
// decided_by/decided_at (and mast_id when approved or merged, reason when rejected); rows are
// never deleted, so every report keeps its fate.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('sightings', (t) => {
    t.bigIncrements('id').primary();
    t.uuid('client_uuid').notNullable();
    t.bigInteger('author_id').notNullable().references('users.id').onDelete('RESTRICT');
    t.text('status').notNullable().defaultTo('pending');
    t.specificType('geom', 'geography(Point, 4326)').notNullable();
    t.text('position_source').notNullable();
    t.double('position_accuracy_m');
    t.text('structure_type').notNullable();
    t.double('estimated_height_m');
    t.text('notes');
    t.timestamp('observed_at', { useTz: true }).notNullable();
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.bigInteger('decided_by').references('users.id').onDelete('RESTRICT');
    t.timestamp('decided_at', { useTz: true });
    t.text('decision_reason');
    t.bigInteger('mast_id').references('masts.id').onDelete('SET NULL');
    t.check("status IN ('pending','approved','merged','rejected')", [], 'sightings_status_check');
    t.check("position_source IN ('photo','device','map')", [], 'sightings_position_source_check');
    t.check("structure_type IN ('lattice_tower','monopole','rooftop','water_tower','other')", [], 'sightings_structure_type_check');
    t.check('estimated_height_m IS NULL OR (estimated_height_m >= 0 AND estimated_height_m <= 700)', [], 'sightings_height_check');
    t.check('position_accuracy_m IS NULL OR position_accuracy_m >= 0', [], 'sightings_accuracy_check');
    t.check("(status = 'pending') = (decided_at IS NULL)", [], 'sightings_decided_check');
    t.check("status <> 'rejected' OR decision_reason IS NOT NULL", [], 'sightings_reject_reason_check');
  });
  await knex.raw('CREATE UNIQUE INDEX sightings_client_uuid_idx ON sightings (client_uuid)');
  await knex.raw('CREATE INDEX sightings_geom_idx ON sightings USING gist (geom)');
  await knex.raw('CREATE INDEX sightings_status_created_idx ON sightings (status, created_at)');
  await knex.raw('CREATE INDEX sightings_author_created_idx ON sightings (author_id, created_at)');
  await knex.raw('CREATE INDEX sightings_mast_idx ON sightings (mast_id) WHERE mast_id IS NOT NULL');
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('sightings');
}
