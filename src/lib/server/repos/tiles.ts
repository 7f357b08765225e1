// Mapbox Vector Tiles straight from PostGIS (ST_AsMVT / ST_AsMVTGeom / ST_TileEnvelope): tiles are
// addressed z/x/y in the Web Mercator (EPSG:3857) XYZ scheme with y counted from the north, the
// common practice of web maps (OGC Two Dimensional Tile Matrix Set "WebMercatorQuad").
import type { Knex } from 'knex';
import type { Tx } from '../db';
import type { MastFilter } from '../../schemas/mast-query';
import { applyMastFilter } from './masts';

/** Tile coordinate units per side (the MVT default). */
export const TILE_EXTENT = 4096;
/** Geometry kept beyond the tile edge, in tile units, so symbols and lines are not cut at seams. */
export const TILE_BUFFER = 64;

export const TILE_LAYERS = ['basemap', 'masts', 'signal'] as const;
export type TileLayer = (typeof TILE_LAYERS)[number];

/** MVT layers in the basemap tile, bottom to top, with the attributes each carries. */
export const BASEMAP_MVT_LAYERS = [
  { name: 'land', table: 'basemap_land', columns: ['name', 'kind'] },
  { name: 'landuse', table: 'basemap_landuse', columns: ['name', 'kind'] },
  { name: 'water', table: 'basemap_water', columns: ['name', 'kind'] },
  { name: 'roads', table: 'basemap_roads', columns: ['name', 'kind', 'ref'] },
  { name: 'places', table: 'basemap_places', columns: ['name', 'kind', 'rank', 'population', 'ele_m'] },
] as const;

/** Attributes of each feature in the `masts` MVT layer (the feature id is the mast id too). */
export const MAST_MVT_ATTRIBUTES = ['id', 'name', 'status', 'structure_type', 'op_ids', 'op_count', 'bands', 'techs', 'cell_count'] as const;

/** A query yielding one row with the finished tile in column `tile` (null or empty when nothing is in it). */
export type TileQuery = Knex.Raw<{ rows: Array<{ tile: Buffer | null }> }>;

export interface TileAddress {
  z: number;
  x: number;
  y: number;
}

const margin = TILE_BUFFER / TILE_EXTENT;

/** One MVT layer: rows of `table` that touch the tile (plus buffer), clipped and quantised to it. */
function basemapLayerSql(layer: (typeof BASEMAP_MVT_LAYERS)[number]): string {
  const cols = layer.columns.map((c) => `t.${c}`).join(', ');
  return `(SELECT coalesce(ST_AsMVT(q, '${layer.name}', ${TILE_EXTENT}, 'geom', 'fid'), ''::bytea) FROM (
      SELECT t.id AS fid, ${cols},
        ST_AsMVTGeom(ST_Transform(t.geom, 3857), b.env, ${TILE_EXTENT}, ${TILE_BUFFER}, true) AS geom
      FROM ${layer.table} t, bounds b
      WHERE t.geom && b.env4326
      ORDER BY t.id
    ) q WHERE q.geom IS NOT NULL)`;
}

const BASEMAP_TILE_SQL = `
  WITH bounds AS (
    SELECT ST_TileEnvelope(?, ?, ?) AS env,
           ST_Transform(ST_TileEnvelope(?, ?, ?, margin => ${margin}), 4326) AS env4326
  )
  SELECT ${BASEMAP_MVT_LAYERS.map(basemapLayerSql).join(' || ')} AS tile`;

/** The basemap tile query (one row, column `tile`): layers land, landuse, water, roads, places concatenated. */
export function basemapTileQuery(db: Tx, t: TileAddress): TileQuery {
  return db.raw(BASEMAP_TILE_SQL, [t.z, t.x, t.y, t.z, t.x, t.y]);
}

/** The basemap tile (an empty buffer when nothing is there). */
export async function getBasemapTile(db: Tx, t: TileAddress): Promise<Buffer> {
  const { rows } = await basemapTileQuery(db, t);
  return rows[0]?.tile ?? Buffer.alloc(0);
}

/**
 * Below this zoom masts that share a grid square are drawn as one cluster with a count. This and
 * MAST_CLUSTER_GRID are also fixed in the migration that counts the squares ahead
 * (mast_cluster_squares): change them together.
 */
export const MAST_CLUSTER_BELOW_ZOOM = 9;
/** Grid squares per tile side for clustering (a square is 1/32 of the tile, ~16 px on a 512 px tile). */
export const MAST_CLUSTER_GRID = 32;

/** The columns of one mast's MVT feature (alias m: masts, s: mast_cell_summaries; needs CTE `bounds`). */
const MAST_FEATURE_COLUMNS = `m.id AS fid, m.id, m.name, m.status, m.structure_type,
        array_to_string(coalesce(s.op_ids, '{}'), ',') AS op_ids,
        coalesce(cardinality(s.op_ids), 0) AS op_count,
        array_to_string(coalesce(s.bands, '{}'), ',') AS bands,
        array_to_string(coalesce(s.techs, '{}'), ',') AS techs,
        coalesce(s.cell_count, 0) AS cell_count,
        ST_AsMVTGeom(m.geom_3857, (SELECT env FROM bounds), ${TILE_EXTENT}, ${TILE_BUFFER}, true) AS geom`;

/** Layer `masts` of the features yielded by `featuresSql` (rows of MAST_FEATURE_COLUMNS). */
const mastLayerSql = (featuresSql: string) =>
  `(SELECT coalesce(ST_AsMVT(q, 'masts', ${TILE_EXTENT}, 'geom', 'fid'), ''::bytea) FROM (${featuresSql}) q WHERE q.geom IS NOT NULL)`;

/** Per-mast MVT features (layer `masts`) for the masts chosen by `idsSql` (a query yielding `id`). */
function mastFeaturesSql(idsSql: string): string {
  return mastLayerSql(`SELECT ${MAST_FEATURE_COLUMNS}
      FROM masts m LEFT JOIN mast_cell_summaries s ON s.mast_id = m.id
      WHERE m.id IN (${idsSql})
      ORDER BY m.id`);
}

/**
 * The masts tile. From MAST_CLUSTER_BELOW_ZOOM on: layer `masts`, every mast in the tile (plus
 * buffer). Below it: masts alone in their grid square stay in `masts`; squares holding several
 * become one feature in layer `mast_clusters` at their masts' mean position, with `point_count`.
 * Filtered like the mast list. Each mast's summary comes from mast_cell_summaries (kept by
 * triggers on cells), so no per-mast join over cells is needed.
 */
export async function getMastsTile(db: Tx, t: TileAddress, filter: MastFilter): Promise<Buffer> {
  const { rows } = await mastsTileQuery(db, t, filter);
  return rows[0]?.tile ?? Buffer.alloc(0);
}

/** The masts tile query (one row, column `tile`); the benchmark runs the same SQL in psql. */
export function mastsTileQuery(db: Tx, t: TileAddress, filter: MastFilter): TileQuery {
  const clustered = t.z < MAST_CLUSTER_BELOW_ZOOM;
  const inTile = db('masts as m')
    .select('m.id', 'm.geom_3857')
    .whereRaw(`m.geom_3857 && ST_TileEnvelope(?, ?, ?${clustered ? '' : `, margin => ${margin}`})`, [t.z, t.x, t.y]);
  applyMastFilter(db, inTile, filter);
  if (clustered && !hasMastFilter(filter)) return precountedClustersQuery(db, t);
  const sql = clustered
    ? `WITH bounds AS (SELECT ST_TileEnvelope(:z, :x, :y) AS env),
            grid AS (SELECT ST_XMin(env) AS x0, ST_YMin(env) AS y0, (ST_XMax(env) - ST_XMin(env)) / ${MAST_CLUSTER_GRID} AS size FROM bounds),
            pts AS (:inTile),
            squares AS (
              SELECT count(*)::int AS n, min(p.id) AS id, avg(ST_X(p.geom_3857)) AS cx, avg(ST_Y(p.geom_3857)) AS cy
                FROM pts p, grid g
               GROUP BY floor((ST_X(p.geom_3857) - g.x0) / g.size), floor((ST_Y(p.geom_3857) - g.y0) / g.size))
       SELECT ${mastFeaturesSql('SELECT id FROM squares WHERE n = 1')}
         || (SELECT coalesce(ST_AsMVT(k, 'mast_clusters', ${TILE_EXTENT}, 'geom'), ''::bytea) FROM (
              SELECT sq.n AS point_count,
                ST_AsMVTGeom(ST_SetSRID(ST_MakePoint(sq.cx, sq.cy), 3857), (SELECT env FROM bounds), ${TILE_EXTENT}, ${TILE_BUFFER}, true) AS geom
              FROM squares sq WHERE sq.n > 1 ORDER BY sq.n DESC, sq.id
            ) k WHERE k.geom IS NOT NULL) AS tile`
    : `WITH bounds AS (SELECT ST_TileEnvelope(:z, :x, :y) AS env) SELECT ${mastLayerSql(':features')} AS tile`;
  // From the clustering zoom on, one scan of the masts in the tile gives the features.
  const features = clustered
    ? null
    : inTile.clearSelect().select(db.raw(MAST_FEATURE_COLUMNS)).leftJoin('mast_cell_summaries as s', 's.mast_id', 'm.id').orderBy('m.id');
  return db.raw(sql, clustered ? { z: t.z, x: t.x, y: t.y, inTile } : { z: t.z, x: t.x, y: t.y, features: features! });
}

/** Half the width of the Web Mercator square (EPSG:3857), in metres. */
const MERCATOR_HALF = 20037508.342789244;

function hasMastFilter(filter: MastFilter): boolean {
  return !!(filter.statuses?.length || filter.operatorIds?.length || filter.techs?.length || filter.bands?.length);
}

/**
 * An unfiltered low-zoom masts tile from the squares counted ahead (mast_cluster_squares, kept by
 * triggers on masts; its grid is the one above: 2^(z+5) squares per side of the Web Mercator
 * square, 32 per tile). Squares holding one mast become that mast's feature; the others a cluster
 * at the mean position of their masts.
 */
function precountedClustersQuery(db: Tx, t: TileAddress): TileQuery {
  const size = (2 * MERCATOR_HALF) / (MAST_CLUSTER_GRID * 2 ** t.z);
  const gx0 = t.x * MAST_CLUSTER_GRID;
  const gy0 = (2 ** t.z - 1 - t.y) * MAST_CLUSTER_GRID;
  const squareOf = (axis: 'X' | 'Y') => `floor((ST_${axis}(m.geom_3857) + ${MERCATOR_HALF}) / ${size})::int`;
  const sql = `WITH bounds AS (SELECT ST_TileEnvelope(:z, :x, :y) AS env),
      squares AS (
        SELECT q.gx, q.gy, q.n, q.sum_x / q.n AS cx, q.sum_y / q.n AS cy FROM mast_cluster_squares q
         WHERE q.zoom = :z AND q.gx BETWEEN :gx0 AND :gx1 AND q.gy BETWEEN :gy0 AND :gy1 AND q.n > 0),
      singles AS (
        SELECT m.id FROM squares sq JOIN masts m
          ON m.geom_3857 && ST_MakeEnvelope(${-MERCATOR_HALF} + sq.gx * ${size}, ${-MERCATOR_HALF} + sq.gy * ${size},
                                            ${-MERCATOR_HALF} + (sq.gx + 1) * ${size}, ${-MERCATOR_HALF} + (sq.gy + 1) * ${size}, 3857)
         AND ${squareOf('X')} = sq.gx AND ${squareOf('Y')} = sq.gy
         WHERE sq.n = 1)
    SELECT ${mastFeaturesSql('SELECT id FROM singles')}
      || (SELECT coalesce(ST_AsMVT(k, 'mast_clusters', ${TILE_EXTENT}, 'geom'), ''::bytea) FROM (
           SELECT sq.n AS point_count,
             ST_AsMVTGeom(ST_SetSRID(ST_MakePoint(sq.cx, sq.cy), 3857), (SELECT env FROM bounds), ${TILE_EXTENT}, ${TILE_BUFFER}, true) AS geom
           FROM squares sq WHERE sq.n > 1 ORDER BY sq.n DESC, sq.gx, sq.gy
         ) k WHERE k.geom IS NOT NULL) AS tile`;
  return db.raw(sql, { z: t.z, x: t.x, y: t.y, gx0, gx1: gx0 + MAST_CLUSTER_GRID - 1, gy0, gy1: gy0 + MAST_CLUSTER_GRID - 1 });
}
