import type { Knex } from 'knex';

// Per-PCI readings taken during an install check (RSRP/RSRQ/SINR as the router reports them).
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('install_check_readings', (t) => {
    t.bigIncrements('id').primary();
    t.bigInteger('check_id').notNullable().references('install_checks.id').onDelete('CASCADE');
    t.integer('pci').notNullable();
    t.integer('channel');
    t.double('rsrp_dbm').notNullable();
    t.double('rsrq_db');
    t.double('sinr_db');
    t.check('pci >= 0 AND pci <= 1007', [], 'install_check_readings_pci_check');
    t.index(['check_id']);
    t.index(['channel', 'pci']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('install_check_readings');
}
