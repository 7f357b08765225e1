import type { Knex } from 'knex';

// What the map shows of each mast's cells (count, operators, bands, technologies), kept by
// statement triggers on cells so a tile or the mast list reads one row per mast instead of
// aggregating its cells. A mast without cells has no row.
const SUMMARY_OF_MAST = `
  SELECT count(*)::int AS cell_count,
    coalesce(array_agg(DISTINCT c.operator_id ORDER BY c.operator_id), '{}') AS op_ids,
    (SELECT coalesce(array_agg(b.band ORDER BY b.f NULLS LAST, b.band), '{}')
       FROM (SELECT band, min(dl_mhz) AS f FROM cells WHERE mast_id = m.id GROUP BY band) b) AS bands,
    (SELECT coalesce(array_agg(t.tech ORDER BY array_position(ARRAY['gsm','umts','lte','nr'], t.tech)), '{}')
       FROM (SELECT DISTINCT tech FROM cells WHERE mast_id = m.id) t) AS techs
  FROM cells c WHERE c.mast_id = m.id`;

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('mast_cell_summaries', (t) => {
    t.bigInteger('mast_id').primary().references('masts.id').onDelete('CASCADE');
    t.integer('cell_count').notNullable();
    t.specificType('op_ids', 'bigint[]').notNullable();
    t.specificType('bands', 'text[]').notNullable();
    t.specificType('techs', 'text[]').notNullable();
  });
  await knex.raw(`
    CREATE FUNCTION refresh_mast_cell_summaries(ids bigint[]) RETURNS void LANGUAGE plpgsql AS $$
    BEGIN
      INSERT INTO mast_cell_summaries (mast_id, cell_count, op_ids, bands, techs)
      SELECT m.id, s.cell_count, s.op_ids, s.bands, s.techs
        FROM masts m CROSS JOIN LATERAL (${SUMMARY_OF_MAST}) s
       WHERE m.id = ANY(ids) AND s.cell_count > 0
      ON CONFLICT (mast_id) DO UPDATE
        SET cell_count = EXCLUDED.cell_count, op_ids = EXCLUDED.op_ids, bands = EXCLUDED.bands, techs = EXCLUDED.techs;
      DELETE FROM mast_cell_summaries x
       WHERE x.mast_id = ANY(ids) AND NOT EXISTS (SELECT 1 FROM cells c WHERE c.mast_id = x.mast_id);
    END $$`);
  await knex.raw(`
    CREATE FUNCTION cells_refresh_summaries() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      IF TG_OP = 'TRUNCATE' THEN
        DELETE FROM mast_cell_summaries;
      ELSIF TG_OP = 'INSERT' THEN
        PERFORM refresh_mast_cell_summaries(ARRAY(SELECT DISTINCT mast_id FROM new_rows));
      ELSIF TG_OP = 'DELETE' THEN
        PERFORM refresh_mast_cell_summaries(ARRAY(SELECT DISTINCT mast_id FROM old_rows));
      ELSE
        PERFORM refresh_mast_cell_summaries(ARRAY(SELECT mast_id FROM new_rows UNION SELECT mast_id FROM old_rows));
      END IF;
      RETURN NULL;
    END $$`);
  await knex.raw(`CREATE TRIGGER cells_summaries_insert AFTER INSERT ON cells REFERENCING NEW TABLE AS new_rows
    FOR EACH STATEMENT EXECUTE FUNCTION cells_refresh_summaries()`);
  await knex.raw(`CREATE TRIGGER cells_summaries_update AFTER UPDATE ON cells REFERENCING OLD TABLE AS old_rows NEW TABLE AS new_rows
    FOR EACH STATEMENT EXECUTE FUNCTION cells_refresh_summaries()`);
  await knex.raw(`CREATE TRIGGER cells_summaries_delete AFTER DELETE ON cells REFERENCING OLD TABLE AS old_rows
    FOR EACH STATEMENT EXECUTE FUNCTION cells_refresh_summaries()`);
  await knex.raw(`CREATE TRIGGER cells_summaries_truncate AFTER TRUNCATE ON cells
    FOR EACH STATEMENT EXECUTE FUNCTION cells_refresh_summaries()`);
  await knex.raw('SELECT refresh_mast_cell_summaries(ARRAY(SELECT DISTINCT mast_id FROM cells))');

  // Tiles are cut in Web Mercator: keep each mast's position there too, indexed.
  await knex.raw('ALTER TABLE masts ADD COLUMN geom_3857 geometry(Point, 3857) GENERATED ALWAYS AS (ST_Transform(geom, 3857)) STORED');
  await knex.raw('CREATE INDEX masts_geom_3857_idx ON masts USING gist (geom_3857)');
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('DROP INDEX masts_geom_3857_idx');
  await knex.raw('ALTER TABLE masts DROP COLUMN geom_3857');
  for (const t of ['insert', 'update', 'delete', 'truncate']) await knex.raw(`DROP TRIGGER cells_summaries_${t} ON cells`);
  await knex.raw('DROP FUNCTION cells_refresh_summaries()');
  await knex.raw('DROP FUNCTION refresh_mast_cell_summaries(bigint[])');
  await knex.schema.dropTable('mast_cell_summaries');
}
