// Mapbox Vector Tiles straight from PostGIS (ST_AsMVT / ST_AsMVTGeom / ST_TileEnvelope): tiles are
// addressed z/x/y in the Web Mercator (EPSG:3857) XYZ scheme with y counted from the north, the
// common practice of web maps (OGC Two Dimensional Tile Matrix Set "WebMercatorQuad").
import type { Tx } from '../db';
import type { MastFilter } from '../../schemas/masts';
import { applyMastFilter, MAST_CELL_SUMMARY_SQL } from './masts';

/** Tile coordinate units per side (the MVT default). */
export const TILE_EXTENT = 4096;
/** Geometry kept beyond the tile edge, in tile units, so symbols and lines are not cut at seams. */
export const TILE_BUFFER = 64;

export const TILE_LAYERS = ['basemap', 'masts'] as const;
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

/** The basemap tile: layers land, landuse, water, roads, places concatenated (an empty buffer when nothing is there). */
export async function getBasemapTile(db: Tx, t: TileAddress): Promise<Buffer> {
  const { rows } = await db.raw<{ rows: Array<{ tile: Buffer }> }>(BASEMAP_TILE_SQL, [t.z, t.x, t.y, t.z, t.x, t.y]);
  return rows[0]?.tile ?? Buffer.alloc(0);
}

/** The masts tile: one layer `masts`, filtered like the mast list. */
export async function getMastsTile(db: Tx, t: TileAddress, filter: MastFilter): Promise<Buffer> {
  const inner = db('masts as m')
    .select(
      'm.id as fid',
      'm.id',
      'm.name',
      'm.status',
      'm.structure_type',
      db.raw(`array_to_string(s.op_ids, ',') AS op_ids`),
      db.raw('cardinality(s.op_ids) AS op_count'),
      db.raw(`array_to_string(s.bands, ',') AS bands`),
      db.raw(`array_to_string(s.techs, ',') AS techs`),
      's.cell_count',
      db.raw(`ST_AsMVTGeom(ST_Transform(m.geom, 3857), ST_TileEnvelope(?, ?, ?), ${TILE_EXTENT}, ${TILE_BUFFER}, true) AS geom`, [t.z, t.x, t.y]),
    )
    .joinRaw(`LEFT JOIN LATERAL (${MAST_CELL_SUMMARY_SQL}) s ON true`)
    .whereRaw(`m.geom && ST_Transform(ST_TileEnvelope(?, ?, ?, margin => ${margin}), 4326)`, [t.z, t.x, t.y])
    .orderBy('m.id');
  applyMastFilter(db, inner, filter);
  const { rows } = await db.raw<{ rows: Array<{ tile: Buffer | null }> }>(
    `SELECT ST_AsMVT(q, 'masts', ${TILE_EXTENT}, 'geom', 'fid') AS tile FROM (?) q WHERE q.geom IS NOT NULL`,
    [inner],
  );
  return rows[0]?.tile ?? Buffer.alloc(0);
}
