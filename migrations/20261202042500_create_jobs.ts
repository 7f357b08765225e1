import type { Knex } from 'knex';

// Background jobs as people see them: who asked, where it stands (0–100), counts and errors. The
// queue itself (pg-boss, schema pgboss) owns delivery and retries; id is the same uuid there.
// heartbeat_at moves while a worker runs the job, so a job whose worker died can be handed back
// to the queue by any instance.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('jobs', (t) => {
    t.uuid('id').primary();
    t.text('queue').notNullable();
    t.bigInteger('owner_id').references('users.id').onDelete('SET NULL');
    t.text('title').notNullable();
    t.text('state').notNullable().defaultTo('queued');
    t.smallint('progress').notNullable().defaultTo(0);
    t.text('phase');
    t.jsonb('counts').notNullable().defaultTo('{}');
    t.jsonb('errors').notNullable().defaultTo('[]');
    t.integer('error_count').notNullable().defaultTo(0);
    t.text('message');
    t.integer('attempts').notNullable().defaultTo(0);
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp('started_at', { useTz: true });
    t.timestamp('heartbeat_at', { useTz: true });
    t.timestamp('finished_at', { useTz: true });
    t.check("state IN ('queued','active','retry','completed','failed')", [], 'jobs_state_check');
    t.check('progress BETWEEN 0 AND 100', [], 'jobs_progress_check');
    t.index(['created_at']);
    t.index(['owner_id', 'created_at']);
    t.index(['state', 'heartbeat_at']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('jobs');
}
