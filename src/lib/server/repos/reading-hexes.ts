// The measured signal map's hexagons (table reading_hexes): recomputed by the signal-hexes job where
// readings changed (reading_hex_dirty), served as vector tiles, and listed for exports.
// Who sees what: readings taken at customers' homes (install checks) count only for roles that may
// see customers (withHomeReadings); everyone else gets hexagons of the other readings alone
// (docs/decisions/0005-signal-hexagons.md).
import type { Knex } from 'knex';
import type { Tx } from '../db';
import {
  HEX_LEVELS,
  fromWebMercator,
  getHexLevel,
  getHexLevelForZoom,
  getHexRangeForBox,
  getTileBox,
  toWebMercator,
  type HexLevel,
} from '../../domain/signal-map';
import { TILE_BUFFER, TILE_EXTENT, type TileAddress, type TileQuery } from './tiles';

/** MVT layer name of the signal tiles. */
export const SIGNAL_MVT_LAYER = 'signal';
/** Attributes of each hexagon in the `signal` MVT layer (a metric's median is absent where it has no readings). */
export const SIGNAL_MVT_ATTRIBUTES = ['readings', 'rsrp_count', 'rsrp_median_dbm', 'rsrq_count', 'rsrq_median_db', 'sinr_count', 'sinr_median_db'] as const;

export interface SignalFilter {
  /** One operator's readings (matched to its cells); null: every reading, matched or not. */
  operatorId: string | null;
  /** One band of the operator (as stored on cells, e.g. B20, n78); null: every band. Needs an operator. */
  band: string | null;
  /** Count readings taken at customers' homes too (only for roles that may see customers). */
  withHomeReadings: boolean;
}

/** Web Mercator easting and northing of a WGS84 point geometry (EPSG:3857 on its sphere), as SQL. */
const mercX = (geom: string) => `(6378137.0 * radians(ST_X(${geom})))`;
const mercY = (geom: string) => `(6378137.0 * ln(tan(pi() / 4 + radians(ST_Y(${geom})) / 2)))`;

/**
 * A LATERAL join giving `alias.i`, `alias.j`: the hexagon of a grid of edge `size` (a bound parameter
 * or number) holding the point — the same rounding as getHexCell in lib/domain/signal-map.ts.
 */
export function hexCellSql(alias: string, geom: string, size: string): string {
  return `CROSS JOIN LATERAL (
    SELECT c.q AS i, c.r + (c.q - (c.q & 1)) / 2 AS j FROM (
      SELECT (CASE WHEN d.dq > d.dr AND d.dq > d.ds THEN -d.r0 - d.s0 ELSE d.q0 END)::int AS q,
             (CASE WHEN d.dq > d.dr AND d.dq > d.ds THEN d.r0 WHEN d.dr > d.ds THEN -d.q0 - d.s0 ELSE d.r0 END)::int AS r
      FROM (
        SELECT b.q0, b.r0, b.s0, abs(b.q0 - b.qf) AS dq, abs(b.r0 - b.rf) AS dr, abs(b.s0 + b.qf + b.rf) AS ds FROM (
          SELECT a.qf, a.rf, round(a.qf) AS q0, round(a.rf) AS r0, round(-a.qf - a.rf) AS s0 FROM (
            SELECT (2.0 / 3.0 * ${mercX(geom)}) / ${size} AS qf,
                   (-1.0 / 3.0 * ${mercX(geom)} + sqrt(3.0) / 3.0 * ${mercY(geom)}) / ${size} AS rf
          ) a
        ) b
      ) d
    ) c
  ) ${alias}`;
}

/** Hexagon i, j of a grid of edge `size` as a Web Mercator polygon, as SQL. */
const hexagonSql = (size: string, i: string, j: string) => `ST_Hexagon(${size}, ${i}, ${j}, ST_SetSRID(ST_MakePoint(0, 0), 3857))`;

/**
 * SQL: the hexagon i, j's centre lies in the box (Web Mercator), with the box as named parameters;
 * the column and row ranges first, for the index.
 */
const centreInBoxSql = (i: string, j: string) =>
  `(${i} BETWEEN :iMin AND :iMax AND ${j} BETWEEN :jMin AND :jMax
    AND 1.5 * :size * ${i} BETWEEN :cxmin AND :cxmax AND sqrt(3.0) * :size * (${j} + (${i} & 1) / 2.0) BETWEEN :cymin AND :cymax)`;

const AGGREGATES = `count(*) AS readings,
  count(r.rsrp_dbm) AS rsrp_count, percentile_cont(0.5) WITHIN GROUP (ORDER BY r.rsrp_dbm) AS rsrp_median_dbm,
  count(r.rsrq_db) AS rsrq_count, percentile_cont(0.5) WITHIN GROUP (ORDER BY r.rsrq_db) AS rsrq_median_db,
  count(r.sinr_db) AS sinr_count, percentile_cont(0.5) WITHIN GROUP (ORDER BY r.sinr_db) AS sinr_median_db,
  min(r.taken_at) AS first_taken_at, max(r.taken_at) AS last_taken_at`;

const COLUMNS = `level, i, j, audience, operator_id, band, readings, rsrp_count, rsrp_median_dbm, rsrq_count, rsrq_median_db,
  sinr_count, sinr_median_db, first_taken_at, last_taken_at`;

// Every operator and band; each operator; each operator's band. Readings matched to no cell count
// only in the first (their operator is unknown).
const GROUPING = `GROUP BY GROUPING SETS ((h.i, h.j), (h.i, h.j, c.operator_id), (h.i, h.j, c.operator_id, c.band))
  HAVING GROUPING(c.operator_id) = 1 OR c.operator_id IS NOT NULL`;

type Box = readonly [west: number, south: number, east: number, north: number];

/** Latitude limit of Web Mercator (EPSG:3857's square world). */
const MAX_LAT = 85.05112878;
const clampLat = (lat: number) => Math.max(-MAX_LAT, Math.min(MAX_LAT, lat));

interface RegionParams {
  size: number;
  iMin: number;
  iMax: number;
  jMin: number;
  jMax: number;
  cxmin: number;
  cymin: number;
  cxmax: number;
  cymax: number;
  gw: number;
  gs: number;
  ge: number;
  gn: number;
}

/**
 * Where to recompute a level after readings in `box` changed: every hexagon whose centre lies within
 * one edge of the box (all that can touch it), from the readings within two edges (all those
 * hexagons can hold).
 */
function regionFor(level: HexLevel, box: Box): RegionParams {
  const sw = toWebMercator(box[0], clampLat(box[1]));
  const ne = toWebMercator(box[2], clampLat(box[3]));
  const s = level.sizeM;
  const gsw = fromWebMercator(sw.x - 2 * s, sw.y - 2 * s);
  const gne = fromWebMercator(ne.x + 2 * s, ne.y + 2 * s);
  const centres = { xmin: sw.x - s, ymin: sw.y - s, xmax: ne.x + s, ymax: ne.y + s };
  return {
    size: s,
    ...getHexRangeForBox(s, centres),
    cxmin: centres.xmin,
    cymin: centres.ymin,
    cxmax: centres.xmax,
    cymax: centres.ymax,
    gw: gsw.lon,
    gs: gsw.lat,
    ge: gne.lon,
    gn: gne.lat,
  };
}

/** Recomputes one level's hexagons in `box` (everywhere when null), both audiences. Returns the rows written. */
async function recomputeLevel(trx: Knex.Transaction, level: HexLevel, box: Box | null): Promise<number> {
  const params: Record<string, number> = box ? { ...regionFor(level, box), level: level.level } : { size: level.sizeM, level: level.level };
  const inRegion = box ? `AND r.geom && ST_MakeEnvelope(:gw, :gs, :ge, :gn, 4326) AND ${centreInBoxSql('h.i', 'h.j')}` : '';
  await trx.raw(`DELETE FROM reading_hexes WHERE level = :level ${box ? `AND ${centreInBoxSql('i', 'j')}` : ''}`, params);
  const survey = await trx.raw(
    `INSERT INTO reading_hexes (${COLUMNS})
     SELECT :level, h.i, h.j, 'survey', c.operator_id, c.band, ${AGGREGATES}
       FROM readings r LEFT JOIN cells c ON c.id = r.cell_id
       ${hexCellSql('h', 'r.geom', ':size')}
      WHERE r.install_check_id IS NULL ${inRegion}
      ${GROUPING}`,
    params,
  );
  // Hexagons holding a reading from a customer's home get a second row counting every reading.
  const all = await trx.raw(
    `WITH homes AS (
       SELECT DISTINCT h.i, h.j FROM readings r ${hexCellSql('h', 'r.geom', ':size')}
        WHERE r.install_check_id IS NOT NULL ${inRegion})
     INSERT INTO reading_hexes (${COLUMNS})
     SELECT :level, h.i, h.j, 'all', c.operator_id, c.band, ${AGGREGATES}
       FROM homes hm
       JOIN readings r ON r.geom && ST_Transform(${hexagonSql(':size', 'hm.i', 'hm.j')}, 4326)
       LEFT JOIN cells c ON c.id = r.cell_id
       ${hexCellSql('h', 'r.geom', ':size')}
      WHERE h.i = hm.i AND h.j = hm.j
      ${GROUPING}`,
    params,
  );
  return (survey.rowCount ?? 0) + (all.rowCount ?? 0);
}

/** Above this many changed areas the job recomputes their common extent once instead of each. */
const MAX_SEPARATE_AREAS = 20;
/** Advisory lock held while hexagons are recomputed (one job at a time, whatever the queue does). */
const REFRESH_LOCK_KEY = 7_204_113;

export interface HexRefreshResult {
  /** Changed areas taken from reading_hex_dirty (0: nothing to do). */
  areas: number;
  /** Whether everything was recomputed. */
  everywhere: boolean;
  /** Hexagon rows written, all levels. */
  rows: number;
}

/**
 * Recomputes the hexagons of every level where readings changed since the last run, in one
 * transaction with taking those changes off reading_hex_dirty: a failed run leaves them for the next.
 */
export async function refreshReadingHexes(db: Knex, onLevel?: (done: number, total: number) => Promise<void>): Promise<HexRefreshResult> {
  return db.transaction(async (trx) => {
    await trx.raw("SET LOCAL statement_timeout = '60min'");
    await trx.raw('SET LOCAL jit = off');
    // Medians sort every hexagon's readings: in memory rather than on disk (one job at a time).
    await trx.raw("SET LOCAL work_mem = '128MB'");
    await trx.raw('SELECT pg_advisory_xact_lock(?)', [REFRESH_LOCK_KEY]);
    const dirty: Array<{ id: string; w: number | null; s: number | null; e: number | null; n: number | null }> = await trx('reading_hex_dirty')
      .select('id', trx.raw('ST_XMin(box) AS w'), trx.raw('ST_YMin(box) AS s'), trx.raw('ST_XMax(box) AS e'), trx.raw('ST_YMax(box) AS n'))
      .orderBy('id');
    if (dirty.length === 0) return { areas: 0, everywhere: false, rows: 0 };
    const everywhere = dirty.some((d) => d.w === null);
    let boxes: Box[] | null = everywhere ? null : dirty.map((d) => [d.w!, d.s!, d.e!, d.n!] as const);
    if (boxes && boxes.length > MAX_SEPARATE_AREAS) {
      boxes = [
        [Math.min(...boxes.map((b) => b[0])), Math.min(...boxes.map((b) => b[1])), Math.max(...boxes.map((b) => b[2])), Math.max(...boxes.map((b) => b[3]))],
      ];
    }
    let rows = 0;
    for (const [index, level] of HEX_LEVELS.entries()) {
      if (boxes === null) rows += await recomputeLevel(trx, level, null);
      else for (const box of boxes) rows += await recomputeLevel(trx, level, box);
      await onLevel?.(index + 1, HEX_LEVELS.length);
    }
    await trx('reading_hex_dirty')
      .whereIn(
        'id',
        dirty.map((d) => d.id),
      )
      .delete();
    return { areas: dirty.length, everywhere, rows };
  });
}

/** Whether readings changed since the hexagons were last recomputed. */
export async function hasDirtyReadingHexes(db: Tx): Promise<boolean> {
  const { rows } = await db.raw<{ rows: Array<{ dirty: boolean }> }>('SELECT EXISTS (SELECT 1 FROM reading_hex_dirty) AS dirty');
  return rows[0]!.dirty;
}

/** The rows of one level matching the filter, one per hexagon (the 'all' row where the caller may count homes). */
function hexRowsSql(f: SignalFilter): string {
  return `SELECT DISTINCT ON (i, j) * FROM reading_hexes
     WHERE level = :level AND audience IN (${f.withHomeReadings ? `'survey', 'all'` : `'survey'`})
       AND ${f.operatorId === null ? 'operator_id IS NULL' : 'operator_id = :operatorId'}
       AND ${f.band === null ? 'band IS NULL' : 'band = :band'}
       AND i BETWEEN :iMin AND :iMax AND j BETWEEN :jMin AND :jMax
     ORDER BY i, j, audience`;
}

/** The signal tile query (one row, column `tile`): layer `signal`, one polygon per hexagon of the zoom's level, with counts and medians. */
export function signalTileQuery(db: Tx, t: TileAddress, f: SignalFilter): TileQuery {
  const level = getHexLevelForZoom(t.z);
  const box = getTileBox(t.z, t.x, t.y);
  const margin = ((box.xmax - box.xmin) * TILE_BUFFER) / TILE_EXTENT;
  const range = getHexRangeForBox(level.sizeM, { xmin: box.xmin - margin, ymin: box.ymin - margin, xmax: box.xmax + margin, ymax: box.ymax + margin });
  const round1 = (col: string) => `round(h.${col}::numeric, 1)::float8 AS ${col}`;
  return db.raw(
    `WITH bounds AS (SELECT ST_TileEnvelope(:z, :x, :y) AS env), hexes AS (${hexRowsSql(f)})
       SELECT coalesce(ST_AsMVT(q, '${SIGNAL_MVT_LAYER}', ${TILE_EXTENT}, 'geom'), ''::bytea) AS tile FROM (
         SELECT h.readings, h.rsrp_count, ${round1('rsrp_median_dbm')}, h.rsrq_count, ${round1('rsrq_median_db')},
                h.sinr_count, ${round1('sinr_median_db')},
                ST_AsMVTGeom(${hexagonSql(':size', 'h.i', 'h.j')}, b.env, ${TILE_EXTENT}, ${TILE_BUFFER}, true) AS geom
           FROM hexes h, bounds b
       ) q WHERE q.geom IS NOT NULL`,
    { z: t.z, x: t.x, y: t.y, level: level.level, size: level.sizeM, operatorId: f.operatorId, band: f.band, ...range },
  );
}

export interface ReadingHexRow {
  level: number;
  i: number;
  j: number;
  /** The hexagon as a GeoJSON Polygon (WGS84, lon before lat), as text. */
  geometry: string;
  readings: number;
  rsrp_count: number;
  rsrp_median_dbm: number | null;
  rsrq_count: number;
  rsrq_median_db: number | null;
  sinr_count: number;
  sinr_median_db: number | null;
  first_taken_at: Date;
  last_taken_at: Date;
}

export interface ReadingHexQuery extends SignalFilter {
  /** Hexagon level 0–4 (lib/domain/signal-map.ts HEX_LEVELS; 4 is the finest). */
  level: number;
  /** Hexagons touching this box (west, south, east, north in WGS84 degrees). */
  bbox: Box;
  /** Only hexagons touching this region's outline as well. */
  regionId?: string | null;
}

/**
 * Note for the region page and exports (layer "readings hexagons"): call
 * `readingHexesQuery(db, { level, bbox, regionId, operatorId, band, withHomeReadings })` and await it
 * or `.stream()` it; each row is a ReadingHexRow (medians in dBm / dB, GeoJSON geometry text).
 * Pass `withHomeReadings: can(role, 'plans:view')`, as the tile endpoint does, so that readings
 * from customers' homes reach only those who may see customers. Rows come in column, row order.
 */
export function readingHexesQuery(db: Tx, q: ReadingHexQuery): Knex.Raw<{ rows: ReadingHexRow[] }> {
  const level = getHexLevel(q.level);
  const sw = toWebMercator(q.bbox[0], clampLat(q.bbox[1]));
  const ne = toWebMercator(q.bbox[2], clampLat(q.bbox[3]));
  const range = getHexRangeForBox(level.sizeM, { xmin: sw.x, ymin: sw.y, xmax: ne.x, ymax: ne.y });
  const hexagon4326 = `ST_Transform(${hexagonSql(':size', 'h.i', 'h.j')}, 4326)`;
  return db.raw(
    `WITH hexes AS (${hexRowsSql(q)})
     SELECT h.level, h.i, h.j, ST_AsGeoJSON(${hexagon4326}, 7) AS geometry, h.readings, h.rsrp_count, h.rsrp_median_dbm,
            h.rsrq_count, h.rsrq_median_db, h.sinr_count, h.sinr_median_db, h.first_taken_at, h.last_taken_at
       FROM hexes h
      WHERE ${hexagon4326} && ST_MakeEnvelope(:w, :s, :e, :n, 4326)
        ${q.regionId ? `AND ST_Intersects(${hexagon4326}, (SELECT geom FROM regions WHERE id = :regionId))` : ''}
      ORDER BY h.i, h.j`,
    {
      level: level.level,
      size: level.sizeM,
      operatorId: q.operatorId,
      band: q.band,
      w: q.bbox[0],
      s: q.bbox[1],
      e: q.bbox[2],
      n: q.bbox[3],
      ...(q.regionId ? { regionId: q.regionId } : {}),
      ...range,
    },
  );
}
