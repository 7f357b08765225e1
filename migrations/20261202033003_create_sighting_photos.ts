import type { Knex } from 'knex';

// Photos of a sighting. The files live in the storage (local disk or S3) under content-addressed
// keys: the original as uploaded (reviewers only: it may carry the surveyor's GPS track and
// device details), and a display copy and a thumbnail re-encoded without any metadata. sha256 and
// byte_size describe the original. gps_lat/gps_lon are the position the photo's EXIF tags gave.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('sighting_photos', (t) => {
    t.bigIncrements('id').primary();
    t.bigInteger('sighting_id').notNullable().references('sightings.id').onDelete('CASCADE');
    t.text('sha256').notNullable();
    t.text('mime').notNullable();
    t.bigInteger('byte_size').notNullable();
    t.integer('width').notNullable();
    t.integer('height').notNullable();
    t.text('original_name');
    t.text('original_key').notNullable();
    t.text('display_key').notNullable();
    t.text('thumb_key').notNullable();
    t.double('gps_lat');
    t.double('gps_lon');
    t.timestamp('taken_at', { useTz: true });
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.check("sha256 ~ '^[0-9a-f]{64}$'", [], 'sighting_photos_sha256_check');
    t.check("mime IN ('image/jpeg','image/png','image/webp')", [], 'sighting_photos_mime_check');
    t.check('byte_size > 0 AND width > 0 AND height > 0', [], 'sighting_photos_size_check');
    t.unique(['sighting_id', 'sha256']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('sighting_photos');
}
