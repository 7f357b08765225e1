import type { Knex } from 'knex';

// The measured signal map's aggregates: readings binned into the hexagons of each level's grid
// (lib/domain/signal-map.ts), per operator and band (NULL: every operator / every band), with the
// count and median of RSRP, RSRQ and SINR. audience 'survey' counts readings other than those taken
// at customers' homes (install checks); 'all' rows exist only for hexagons holding such a reading
// and count every reading, for roles that may see customers.
//
// Any write to readings (or a cell changing operator or band) records the area it touched in
// reading_hex_dirty (box in WGS84; NULL = everywhere, after a TRUNCATE) in the same transaction; the
// signal-hexes job recomputes the hexagons there and empties it. Writes to reading_hexes raise the
// 'signal' data version, which keys the tile cache.
export async function up(knex: Knex): Promise<void> {
  await knex.raw(`CREATE TABLE reading_hexes (
    level smallint NOT NULL,
    i integer NOT NULL,
    j integer NOT NULL,
    audience text NOT NULL CONSTRAINT reading_hexes_audience_check CHECK (audience IN ('survey', 'all')),
    operator_id bigint,
    band text,
    readings integer NOT NULL,
    rsrp_count integer NOT NULL,
    rsrp_median_dbm double precision,
    rsrq_count integer NOT NULL,
    rsrq_median_db double precision,
    sinr_count integer NOT NULL,
    sinr_median_db double precision,
    first_taken_at timestamptz NOT NULL,
    last_taken_at timestamptz NOT NULL
  )`);
  await knex.raw(`CREATE UNIQUE INDEX reading_hexes_key_idx ON reading_hexes (level, audience, operator_id, band, i, j) NULLS NOT DISTINCT`);

  await knex.raw(`CREATE TABLE reading_hex_dirty (
    id bigserial PRIMARY KEY,
    box geometry(Geometry, 4326),
    created_at timestamptz NOT NULL DEFAULT now()
  )`);

  await knex.raw(`
    CREATE FUNCTION readings_mark_hexes_dirty() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      IF TG_OP = 'TRUNCATE' THEN
        INSERT INTO reading_hex_dirty (box) VALUES (NULL);
      ELSIF TG_OP = 'INSERT' THEN
        INSERT INTO reading_hex_dirty (box) SELECT ST_SetSRID(ST_Extent(geom)::geometry, 4326) FROM new_rows HAVING count(*) > 0;
      ELSIF TG_OP = 'DELETE' THEN
        INSERT INTO reading_hex_dirty (box) SELECT ST_SetSRID(ST_Extent(geom)::geometry, 4326) FROM old_rows HAVING count(*) > 0;
      ELSE
        -- Only changes the map shows: not the stored model residuals the residual job writes.
        INSERT INTO reading_hex_dirty (box)
        SELECT ST_SetSRID(ST_Extent(g)::geometry, 4326) FROM (
          SELECT unnest(ARRAY[n.geom, o.geom]) AS g
            FROM new_rows n JOIN old_rows o ON o.id = n.id
           WHERE (n.geom::text, n.cell_id, n.rsrp_dbm, n.rsrq_db, n.sinr_db, n.install_check_id, n.taken_at)
                 IS DISTINCT FROM (o.geom::text, o.cell_id, o.rsrp_dbm, o.rsrq_db, o.sinr_db, o.install_check_id, o.taken_at)
        ) changed HAVING count(*) > 0;
      END IF;
      RETURN NULL;
    END $$`);
  await knex.raw(`CREATE TRIGGER readings_hexes_dirty_insert AFTER INSERT ON readings REFERENCING NEW TABLE AS new_rows
    FOR EACH STATEMENT EXECUTE FUNCTION readings_mark_hexes_dirty()`);
  await knex.raw(`CREATE TRIGGER readings_hexes_dirty_update AFTER UPDATE ON readings REFERENCING OLD TABLE AS old_rows NEW TABLE AS new_rows
    FOR EACH STATEMENT EXECUTE FUNCTION readings_mark_hexes_dirty()`);
  await knex.raw(`CREATE TRIGGER readings_hexes_dirty_delete AFTER DELETE ON readings REFERENCING OLD TABLE AS old_rows
    FOR EACH STATEMENT EXECUTE FUNCTION readings_mark_hexes_dirty()`);
  await knex.raw(`CREATE TRIGGER readings_hexes_dirty_truncate AFTER TRUNCATE ON readings
    FOR EACH STATEMENT EXECUTE FUNCTION readings_mark_hexes_dirty()`);

  await knex.raw(`
    CREATE FUNCTION cells_mark_hexes_dirty() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      INSERT INTO reading_hex_dirty (box)
      SELECT ST_SetSRID(ST_Extent(geom)::geometry, 4326) FROM readings WHERE cell_id = NEW.id HAVING count(*) > 0;
      RETURN NULL;
    END $$`);
  await knex.raw(`CREATE TRIGGER cells_hexes_dirty AFTER UPDATE OF operator_id, band ON cells FOR EACH ROW
    WHEN (OLD.operator_id IS DISTINCT FROM NEW.operator_id OR OLD.band IS DISTINCT FROM NEW.band)
    EXECUTE FUNCTION cells_mark_hexes_dirty()`);

  // Everything already stored is still to be binned.
  await knex.raw('INSERT INTO reading_hex_dirty (box) VALUES (NULL)');

  await knex.raw(`INSERT INTO data_versions (name) VALUES ('signal') ON CONFLICT (name) DO NOTHING`);
  await knex.raw(`CREATE TRIGGER reading_hexes_bump_data_version AFTER INSERT OR UPDATE OR DELETE OR TRUNCATE ON reading_hexes
    FOR EACH STATEMENT EXECUTE FUNCTION bump_data_version('signal')`);
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('DROP TRIGGER reading_hexes_bump_data_version ON reading_hexes');
  await knex.raw(`DELETE FROM data_versions WHERE name = 'signal'`);
  await knex.raw('DROP TRIGGER cells_hexes_dirty ON cells');
  await knex.raw('DROP FUNCTION cells_mark_hexes_dirty()');
  for (const op of ['insert', 'update', 'delete', 'truncate']) await knex.raw(`DROP TRIGGER readings_hexes_dirty_${op} ON readings`);
  await knex.raw('DROP FUNCTION readings_mark_hexes_dirty()');
  await knex.raw('DROP TABLE reading_hex_dirty');
  await knex.raw('DROP TABLE reading_hexes');
}
