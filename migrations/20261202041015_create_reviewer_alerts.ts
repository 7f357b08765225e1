import type { Knex } from 'knex';

// When each reviewer was last told that sightings wait, so that any app server can send the
// alerts and nobody gets more than one an hour.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('reviewer_alerts', (t) => {
    t.bigInteger('user_id').primary().references('users.id').onDelete('CASCADE');
    t.timestamp('last_sent_at', { useTz: true }).notNullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('reviewer_alerts');
}
