import type { Knex } from 'knex';

// What received a reading: most come from a phone or router's own antenna at hand height (both
// null), but readings fed back from verified installs come through the installed antenna and
// cable at the mount height, and calibration must take that gain and height out again.
// install_check_id names the check a fed-back reading came from. It is deliberately not a
// foreign key: readings are bulk data, and clearing plans or checks (TRUNCATE … CASCADE in the
// demo seeds) must never sweep the survey readings away with them.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('readings', (t) => {
    t.double('antenna_gain_dbi');
    t.double('height_m');
    t.bigInteger('install_check_id');
    t.index(['install_check_id']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('readings', (t) => {
    t.dropIndex(['install_check_id']);
    t.dropColumn('install_check_id');
    t.dropColumn('height_m');
    t.dropColumn('antenna_gain_dbi');
  });
}
