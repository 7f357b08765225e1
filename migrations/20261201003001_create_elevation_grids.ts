import type { Knex } from 'knex';

// Imported elevation grids (DEM tiles). The samples themselves live in a file under
// <data dir>/elevation/ named by their checksum; this row holds what is needed to find,
// read, verify and list them. sha256 is the checksum of the file as uploaded, so the
// same file cannot be imported twice.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('elevation_grids', (t) => {
    t.bigIncrements('id').primary();
    t.text('name').notNullable();
    t.text('format').notNullable();
    t.text('sha256').notNullable();
    t.bigInteger('byte_size').notNullable();
    t.integer('width').notNullable();
    t.integer('height').notNullable();
    t.text('registration').notNullable();
    t.double('west').notNullable();
    t.double('south').notNullable();
    t.double('east').notNullable();
    t.double('north').notNullable();
    t.double('nodata');
    t.text('sample_type').notNullable();
    t.double('min_m');
    t.double('max_m');
    t.bigInteger('nodata_count').notNullable().defaultTo(0);
    t.text('samples_file').notNullable();
    t.text('samples_sha256').notNullable();
    t.specificType('bounds', 'geometry(Polygon, 4326)').notNullable();
    t.bigInteger('uploaded_by').references('id').inTable('users').onDelete('SET NULL');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.check("format IN ('geotiff','hgt')", [], 'elevation_grids_format_check');
    t.check("registration IN ('point','area')", [], 'elevation_grids_registration_check');
    t.check("sample_type IN ('int16','float32')", [], 'elevation_grids_sample_type_check');
    t.check('width >= 2 AND height >= 2', [], 'elevation_grids_size_check');
    t.check('west < east AND south < north', [], 'elevation_grids_bounds_check');
    t.check("sha256 ~ '^[0-9a-f]{64}$' AND samples_sha256 ~ '^[0-9a-f]{64}$'", [], 'elevation_grids_checksum_check');
  });
  await knex.raw('CREATE UNIQUE INDEX elevation_grids_sha256_idx ON elevation_grids (sha256)');
  await knex.raw('CREATE INDEX elevation_grids_bounds_idx ON elevation_grids USING gist (bounds)');
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('elevation_grids');
}
