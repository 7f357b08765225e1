import type { Knex } from 'knex';

// The mast clusters of the low zooms, counted ahead: for each zoom below the one where every mast is
// drawn, the masts per grid square (a tile is 32 × 32 squares, so the squares of zoom z form one
// Web Mercator grid of 2^(z+5) per side), with the sums of their positions for the mean. Statement
// triggers on masts keep it, so an unfiltered low-zoom tile reads a few hundred squares instead of
// grouping every mast in it. Must match MAST_CLUSTER_BELOW_ZOOM and MAST_CLUSTER_GRID in
// src/lib/server/repos/tiles.ts.
const BELOW_ZOOM = 9;
const GRID = 32;
/** Half the width of the Web Mercator square (EPSG:3857), in metres. */
const HALF = 20037508.342789244;

/** Rows (zoom, gx, gy, dn, dx, dy) of `source`, which yields (g geometry(Point, 3857), s int). */
const SQUARES_OF = (source: string) => `
  SELECT z.zoom, floor((ST_X(d.g) + ${HALF}) / (${2 * HALF} / (${GRID} * 2 ^ z.zoom)))::int AS gx,
    floor((ST_Y(d.g) + ${HALF}) / (${2 * HALF} / (${GRID} * 2 ^ z.zoom)))::int AS gy,
    sum(d.s)::int AS dn, sum(d.s * ST_X(d.g)) AS dx, sum(d.s * ST_Y(d.g)) AS dy
  FROM (${source}) d CROSS JOIN generate_series(0, ${BELOW_ZOOM - 1}) AS z(zoom)
  WHERE d.g IS NOT NULL
  GROUP BY 1, 2, 3`;

/** Adds the rows of SQUARES_OF to the counts. */
const ADD = (squares: string) => `
  INSERT INTO mast_cluster_squares AS q (zoom, gx, gy, n, sum_x, sum_y) ${squares}
  ON CONFLICT (zoom, gx, gy) DO UPDATE SET n = q.n + EXCLUDED.n, sum_x = q.sum_x + EXCLUDED.sum_x, sum_y = q.sum_y + EXCLUDED.sum_y`;

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('mast_cluster_squares', (t) => {
    t.smallint('zoom').notNullable();
    t.integer('gx').notNullable();
    t.integer('gy').notNullable();
    t.integer('n').notNullable();
    t.double('sum_x').notNullable();
    t.double('sum_y').notNullable();
    t.primary(['zoom', 'gx', 'gy']);
  });
  // Squares a delete or a move emptied, found at once and removed in the same statement's trigger.
  await knex.raw('CREATE INDEX mast_cluster_squares_empty_idx ON mast_cluster_squares (zoom) WHERE n <= 0');
  await knex.raw(`
    CREATE FUNCTION masts_refresh_cluster_squares() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      IF TG_OP = 'TRUNCATE' THEN
        DELETE FROM mast_cluster_squares;
        RETURN NULL;
      ELSIF TG_OP = 'INSERT' THEN
        ${ADD(SQUARES_OF('SELECT geom_3857 AS g, 1 AS s FROM new_rows'))};
      ELSIF TG_OP = 'DELETE' THEN
        ${ADD(SQUARES_OF('SELECT geom_3857 AS g, -1 AS s FROM old_rows'))};
      ELSE
        -- Only masts that moved change a square (a rename leaves every count as it was).
        ${ADD(
          SQUARES_OF(`SELECT x.g, x.s FROM new_rows n JOIN old_rows o ON o.id = n.id
            CROSS JOIN LATERAL (VALUES (n.geom_3857, 1), (o.geom_3857, -1)) AS x(g, s)
            WHERE NOT (n.geom_3857 ~= o.geom_3857)`),
        )};
      END IF;
      DELETE FROM mast_cluster_squares WHERE n <= 0;
      RETURN NULL;
    END $$`);
  await knex.raw(`CREATE TRIGGER masts_cluster_squares_insert AFTER INSERT ON masts REFERENCING NEW TABLE AS new_rows
    FOR EACH STATEMENT EXECUTE FUNCTION masts_refresh_cluster_squares()`);
  await knex.raw(`CREATE TRIGGER masts_cluster_squares_update AFTER UPDATE ON masts REFERENCING OLD TABLE AS old_rows NEW TABLE AS new_rows
    FOR EACH STATEMENT EXECUTE FUNCTION masts_refresh_cluster_squares()`);
  await knex.raw(`CREATE TRIGGER masts_cluster_squares_delete AFTER DELETE ON masts REFERENCING OLD TABLE AS old_rows
    FOR EACH STATEMENT EXECUTE FUNCTION masts_refresh_cluster_squares()`);
  await knex.raw(`CREATE TRIGGER masts_cluster_squares_truncate AFTER TRUNCATE ON masts
    FOR EACH STATEMENT EXECUTE FUNCTION masts_refresh_cluster_squares()`);
  await knex.raw(ADD(SQUARES_OF('SELECT geom_3857 AS g, 1 AS s FROM masts')));
}

export async function down(knex: Knex): Promise<void> {
  for (const t of ['insert', 'update', 'delete', 'truncate']) await knex.raw(`DROP TRIGGER masts_cluster_squares_${t} ON masts`);
  await knex.raw('DROP FUNCTION masts_refresh_cluster_squares()');
  await knex.schema.dropTable('mast_cluster_squares');
}
