import type { Knex } from 'knex';

// A survey log on its way in. The upload is checked while it streams and its rows COPYed into
// reading_import_rows (unlogged: bulk scratch data, rebuilt by uploading again if PostgreSQL
// itself crashes); the job then matches cells and moves them into readings in one transaction
// that also marks the import done, so a retried job can never import twice. readings.import_id
// names the import a reading came from (not a foreign key, like install_check_id).
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('reading_imports', (t) => {
    t.bigIncrements('id').primary();
    t.uuid('job_id').unique();
    t.bigInteger('owner_id').references('users.id').onDelete('SET NULL');
    t.text('file_name');
    t.bigInteger('bytes').notNullable().defaultTo(0);
    t.text('sha256');
    t.integer('rows').notNullable().defaultTo(0);
    t.integer('matched').notNullable().defaultTo(0);
    t.text('status').notNullable().defaultTo('staged');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp('finished_at', { useTz: true });
    t.check("status IN ('staged','done','failed')", [], 'reading_imports_status_check');
  });
  await knex.raw(`CREATE UNLOGGED TABLE reading_import_rows (
    import_id bigint NOT NULL,
    line integer NOT NULL,
    taken_at timestamptz NOT NULL,
    lon double precision NOT NULL,
    lat double precision NOT NULL,
    tech text NOT NULL,
    channel integer NOT NULL,
    pci integer,
    rsrp_dbm double precision,
    rsrq_db double precision,
    sinr_db double precision,
    rssi_dbm double precision,
    mcc text,
    mnc text,
    device text,
    antenna_gain_dbi double precision,
    height_m double precision,
    cell_id bigint
  )`);
  await knex.raw('CREATE INDEX reading_import_rows_import_line_idx ON reading_import_rows (import_id, line)');
  await knex.schema.alterTable('readings', (t) => {
    t.bigInteger('import_id');
    t.index(['import_id']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('readings', (t) => {
    t.dropIndex(['import_id']);
    t.dropColumn('import_id');
  });
  await knex.raw('DROP TABLE reading_import_rows');
  await knex.schema.dropTable('reading_imports');
}
