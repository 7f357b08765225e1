import type { Knex } from 'knex';

// One operator's carrier on one sector of a mast. dl_mhz is derived from tech + channel
// (3GPP rasters) when the cell is written, so queries can filter and sort by frequency.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('cells', (t) => {
    t.bigIncrements('id').primary();
    t.bigInteger('mast_id').notNullable().references('masts.id').onDelete('CASCADE');
    t.bigInteger('operator_id').notNullable().references('operators.id').onDelete('RESTRICT');
    t.text('tech').notNullable();
    t.text('band').notNullable();
    t.integer('channel').notNullable();
    t.decimal('dl_mhz', 10, 4);
    t.integer('pci');
    t.bigInteger('cell_identity');
    t.double('sector_azimuth_deg');
    t.double('antenna_height_m');
    t.double('bandwidth_mhz');
    t.double('rs_power_dbm').notNullable().defaultTo(15.2);
    t.timestamp('last_observed_at', { useTz: true });
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp('updated_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.check("tech IN ('gsm','umts','lte','nr')", [], 'cells_tech_check');
    t.check('pci IS NULL OR (pci >= 0 AND pci <= 1007)', [], 'cells_pci_check');
    t.check('sector_azimuth_deg IS NULL OR (sector_azimuth_deg >= 0 AND sector_azimuth_deg < 360)', [], 'cells_azimuth_check');
    t.check('channel >= 0', [], 'cells_channel_check');
    t.index(['mast_id']);
    t.index(['operator_id']);
    t.index(['channel', 'pci']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('cells');
}
