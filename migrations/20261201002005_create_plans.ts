import type { Knex } from 'knex';

// A customer's chosen cell and kit, the figures the planner saw when choosing (snapshot),
// and where the job stands. State rules live in src/lib/domain/plan-state.ts.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('plans', (t) => {
    t.bigIncrements('id').primary();
    t.bigInteger('customer_id').notNullable().references('customers.id').onDelete('RESTRICT');
    t.bigInteger('cell_id').references('cells.id').onDelete('SET NULL');
    t.bigInteger('antenna_id').references('antennas.id').onDelete('RESTRICT');
    t.bigInteger('cable_id').references('cables.id').onDelete('RESTRICT');
    t.double('cable_m');
    t.double('mount_height_m');
    t.jsonb('figures').notNullable().defaultTo('{}');
    t.text('state').notNullable().defaultTo('enquiry');
    t.date('scheduled_for');
    t.text('notes');
    t.bigInteger('created_by').references('users.id').onDelete('SET NULL');
    t.bigInteger('updated_by').references('users.id').onDelete('SET NULL');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp('updated_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp('state_changed_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.integer('row_version').notNullable().defaultTo(1);
    t.check("state IN ('enquiry','planned','scheduled','installed','verified')", [], 'plans_state_check');
    t.check('cable_m IS NULL OR (cable_m >= 0 AND cable_m <= 200)', [], 'plans_cable_m_check');
    t.check('mount_height_m IS NULL OR (mount_height_m >= 0 AND mount_height_m <= 100)', [], 'plans_mount_height_check');
    t.index(['customer_id']);
    t.index(['cell_id']);
    t.index(['state']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('plans');
}
