import type { Knex } from 'knex';

// Each matched reading's residual against the propagation model (measured minus modelled RSRP),
// stored so the shortlist's calibration reads numbers instead of re-profiling every reading.
// residual_basis names the model and the elevation data it was computed with; a residual whose
// basis differs from the current one counts as missing. Triggers clear it when the reading, its
// cell or its mast changes in a way the model depends on.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('readings', (t) => {
    t.double('model_residual_db');
    t.text('residual_basis');
  });
  await knex.raw(`
    CREATE FUNCTION readings_clear_residual() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      IF NEW.residual_basis IS NOT DISTINCT FROM OLD.residual_basis THEN
        NEW.model_residual_db := NULL;
        NEW.residual_basis := NULL;
      END IF;
      RETURN NEW;
    END $$`);
  await knex.raw(`CREATE TRIGGER readings_clear_residual BEFORE UPDATE OF cell_id, rsrp_dbm, geom, antenna_gain_dbi, height_m ON readings
    FOR EACH ROW EXECUTE FUNCTION readings_clear_residual()`);
  await knex.raw(`
    CREATE FUNCTION cells_clear_residuals() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      UPDATE readings SET model_residual_db = NULL, residual_basis = NULL
       WHERE cell_id = NEW.id AND residual_basis IS NOT NULL;
      RETURN NULL;
    END $$`);
  await knex.raw(`CREATE TRIGGER cells_clear_residuals AFTER UPDATE OF mast_id, tech, channel, dl_mhz, sector_azimuth_deg, antenna_height_m, rs_power_dbm ON cells
    FOR EACH ROW EXECUTE FUNCTION cells_clear_residuals()`);
  await knex.raw(`
    CREATE FUNCTION masts_clear_residuals() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      UPDATE readings r SET model_residual_db = NULL, residual_basis = NULL
        FROM cells c WHERE c.mast_id = NEW.id AND r.cell_id = c.id AND r.residual_basis IS NOT NULL;
      RETURN NULL;
    END $$`);
  await knex.raw(`CREATE TRIGGER masts_clear_residuals AFTER UPDATE OF geom, ground_elevation_m, structure_height_m ON masts
    FOR EACH ROW EXECUTE FUNCTION masts_clear_residuals()`);
  // The residual job walks the readings still to do.
  await knex.raw(`CREATE INDEX readings_residual_todo_idx ON readings (cell_id, id)
    WHERE residual_basis IS NULL AND cell_id IS NOT NULL AND rsrp_dbm IS NOT NULL`);
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('DROP INDEX readings_residual_todo_idx');
  await knex.raw('DROP TRIGGER masts_clear_residuals ON masts');
  await knex.raw('DROP FUNCTION masts_clear_residuals()');
  await knex.raw('DROP TRIGGER cells_clear_residuals ON cells');
  await knex.raw('DROP FUNCTION cells_clear_residuals()');
  await knex.raw('DROP TRIGGER readings_clear_residual ON readings');
  await knex.raw('DROP FUNCTION readings_clear_residual()');
  await knex.schema.alterTable('readings', (t) => {
    t.dropColumn('residual_basis');
    t.dropColumn('model_residual_db');
  });
}
