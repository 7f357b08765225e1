import type { Knex } from 'knex';

// Cells a surveyor read near the mast, with what the phone measured where they stood. The columns
// mirror cells (band and dl_mhz derived from tech + channel by the 3GPP rasters) so that approving
// or merging a sighting copies them over unchanged.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('sighting_cells', (t) => {
    t.bigIncrements('id').primary();
    t.bigInteger('sighting_id').notNullable().references('sightings.id').onDelete('CASCADE');
    t.bigInteger('operator_id').notNullable().references('operators.id').onDelete('RESTRICT');
    t.text('tech').notNullable();
    t.text('band').notNullable();
    t.integer('channel').notNullable();
    t.decimal('dl_mhz', 10, 4);
    t.integer('pci');
    t.double('sector_azimuth_deg');
    t.double('rsrp_dbm');
    t.double('rsrq_db');
    t.double('sinr_db');
    t.check("tech IN ('gsm','umts','lte','nr')", [], 'sighting_cells_tech_check');
    t.check('pci IS NULL OR (pci >= 0 AND pci <= 1007)', [], 'sighting_cells_pci_check');
    t.check('sector_azimuth_deg IS NULL OR (sector_azimuth_deg >= 0 AND sector_azimuth_deg < 360)', [], 'sighting_cells_azimuth_check');
    t.check('channel >= 0', [], 'sighting_cells_channel_check');
    t.index(['sighting_id']);
    t.index(['channel', 'pci']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('sighting_cells');
}
