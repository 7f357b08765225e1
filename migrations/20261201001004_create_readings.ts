import type { Knex } from 'knex';

// Measured samples at a place and time. cell_id is the matched cell (by channel + PCI
// near the position), null until matched. Indexed for map queries and for matching.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('readings', (t) => {
    t.bigIncrements('id').primary();
    t.timestamp('taken_at', { useTz: true }).notNullable();
    t.specificType('geom', 'geometry(Point, 4326)').notNullable();
    t.text('tech').notNullable();
    t.integer('channel');
    t.integer('pci');
    t.double('rsrp_dbm');
    t.double('rsrq_db');
    t.double('sinr_db');
    t.double('rssi_dbm');
    t.bigInteger('cell_id').references('cells.id').onDelete('SET NULL');
    t.text('device');
    t.text('source');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.check("tech IN ('gsm','umts','lte','nr')", [], 'readings_tech_check');
    t.index(['channel', 'pci']);
    t.index(['cell_id', 'taken_at']);
    t.index(['taken_at']);
  });
  await knex.raw('CREATE INDEX readings_geom_idx ON readings USING gist (geom)');
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('readings');
}
