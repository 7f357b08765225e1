import type { Knex } from 'knex';

// Operators a surveyor saw on a mast (signs, equipment, the phone's network list), even when no
// cell of theirs was read.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('sighting_operators', (t) => {
    t.bigInteger('sighting_id').notNullable().references('sightings.id').onDelete('CASCADE');
    t.bigInteger('operator_id').notNullable().references('operators.id').onDelete('RESTRICT');
    t.primary(['sighting_id', 'operator_id']);
    t.index(['operator_id']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('sighting_operators');
}
