// The rows of each exportable layer, filtered like the map: masts, their cells, raw readings, and
// readings binned into hexagons. Each layer is one query ordered by id (stable files, and pages
// that continue after the last id), with the columns every format writes.
import type { Knex } from 'knex';
import type { Tx } from '../db';
import { applyMastFilter } from './masts';
import { recordColumns } from './record-sql';
import { MAST_PLACE } from '../../schemas/masts';
import type { ExportLayer, ExportQuery } from '../../schemas/exports';
import type { MastFilter } from '../../schemas/mast-query';
import { readingHexesQuery } from './reading-hexes';
import { fromWebMercator, getHexCentre, getHexLevel, getSignalClass } from '../../domain/signal-map';

export type ExportRow = Record<string, unknown>;

export interface ExportLayerSpec {
  /** At most `limit` rows, in id order, after `afterId` when given (only when `pageable`). */
  page: (limit: number, afterId?: string) => Knex.QueryBuilder | Knex.Raw;
  /** Whether files of this layer can continue after an id (hexagons cannot). */
  pageable: boolean;
  /** Columns in file order; `lat`/`lon` hold a point, `geometry` a GeoJSON polygon (not in CSV). */
  columns: readonly string[];
  /** `point`: lat/lon columns; `geometry`: a GeoJSON geometry column. */
  shape: 'point' | 'geometry';
  /** Name of a KML placemark. */
  placemarkName: (row: ExportRow) => string;
  /** Turns database values into what files hold (ISO times, numbers). */
  toRow: (row: ExportRow) => ExportRow;
}

/** What the caller may see: readings taken at customers' homes only with `seesCustomers`. */
export interface ExportViewer {
  seesCustomers: boolean;
}

/** A query ordered by `column`, cut to pages that continue after an id. */
const pagesOf = (q: Knex.QueryBuilder, column: string) => (limit: number, afterId?: string) => {
  const page = q.clone().limit(limit);
  if (afterId) page.where(column, '>', afterId);
  return page;
};

const iso = (v: unknown) => (v instanceof Date ? v.toISOString() : v);

function whereInArea(db: Tx, q: Knex.QueryBuilder, column: string, query: ExportQuery): void {
  const b = query.bbox;
  if (b) q.whereRaw(`${column} && ST_MakeEnvelope(?, ?, ?, ?, 4326)`, [b.minLon, b.minLat, b.maxLon, b.maxLat]);
  if (query.regionId) q.whereRaw(`ST_Intersects(${column}, (SELECT geom FROM regions WHERE id = ?))`, [query.regionId]);
}

/** Cell filters on a query joined to `cells c` and `masts m`: OR within a list, AND across lists. */
function whereCell(q: Knex.QueryBuilder, filter: MastFilter): void {
  if (filter.statuses?.length) q.whereIn('m.status', filter.statuses);
  if (filter.operatorIds?.length) q.whereIn('c.operator_id', filter.operatorIds);
  if (filter.techs?.length) q.whereIn('c.tech', filter.techs);
  if (filter.bands?.length)
    q.whereIn(
      ['c.tech', 'c.band'],
      filter.bands.map((b) => [b.tech, b.band]),
    );
}

function mastsLayer(db: Tx, query: ExportQuery): ExportLayerSpec {
  const q = db('masts as m')
    .leftJoin('mast_cell_summaries as s', 's.mast_id', 'm.id')
    .select(
      ...recordColumns(db, MAST_PLACE, 'm'),
      'm.ground_elevation_m',
      'm.structure_height_m',
      db.raw('coalesce(s.cell_count, 0)::int AS cell_count'),
      db.raw("(SELECT string_agg(o.name, '; ' ORDER BY o.name) FROM operators o WHERE o.id = ANY(s.op_ids)) AS operators"),
      db.raw("array_to_string(s.techs, '; ') AS techs"),
      db.raw("array_to_string(s.bands, '; ') AS bands"),
      'm.updated_at',
    )
    .orderBy('m.id');
  applyMastFilter(db, q, query.filter);
  whereInArea(db, q, 'm.geom', query);
  return {
    page: pagesOf(q, 'm.id'),
    pageable: true,
    columns: [
      'id',
      'name',
      'reference',
      'status',
      'structure_type',
      'lat',
      'lon',
      'ground_elevation_m',
      'structure_height_m',
      'cell_count',
      'operators',
      'techs',
      'bands',
      'updated_at',
    ],
    shape: 'point',
    placemarkName: (r) => String(r.name),
    toRow: (r) => ({ ...r, id: String(r.id), updated_at: iso(r.updated_at), operators: r.operators ?? '', techs: r.techs ?? '', bands: r.bands ?? '' }),
  };
}

function cellsLayer(db: Tx, query: ExportQuery): ExportLayerSpec {
  const q = db('cells as c')
    .join('masts as m', 'm.id', 'c.mast_id')
    .join('operators as o', 'o.id', 'c.operator_id')
    .select(
      'c.id',
      'c.mast_id',
      db.raw('m.name AS mast_name'),
      db.raw('m.status AS mast_status'),
      'c.operator_id',
      db.raw('o.name AS operator'),
      'o.mcc',
      'o.mnc',
      'c.tech',
      'c.band',
      'c.channel',
      db.raw('c.dl_mhz::float8 AS dl_mhz'),
      'c.pci',
      'c.cell_identity',
      'c.sector_azimuth_deg',
      'c.antenna_height_m',
      'c.bandwidth_mhz',
      db.raw('ST_Y(m.geom) AS lat'),
      db.raw('ST_X(m.geom) AS lon'),
      'c.last_observed_at',
    )
    .orderBy('c.id');
  whereCell(q, query.filter);
  whereInArea(db, q, 'm.geom', query);
  return {
    page: pagesOf(q, 'c.id'),
    pageable: true,
    columns: [
      'id',
      'mast_id',
      'mast_name',
      'mast_status',
      'operator_id',
      'operator',
      'mcc',
      'mnc',
      'tech',
      'band',
      'channel',
      'dl_mhz',
      'pci',
      'cell_identity',
      'sector_azimuth_deg',
      'antenna_height_m',
      'bandwidth_mhz',
      'lat',
      'lon',
      'last_observed_at',
    ],
    shape: 'point',
    placemarkName: (r) => `${r.operator} ${String(r.tech).toUpperCase()} ${r.band} ch ${r.channel}${r.pci === null ? '' : ` PCI ${r.pci}`}`,
    toRow: (r) => ({
      ...r,
      id: String(r.id),
      mast_id: String(r.mast_id),
      operator_id: String(r.operator_id),
      cell_identity: r.cell_identity === null ? null : String(r.cell_identity),
      last_observed_at: iso(r.last_observed_at),
    }),
  };
}

/** Readings joined to their matched cell (when there is one); operator, band and status filters
 * need a matched cell, the technology filter reads the reading's own. */
function readingsBase(db: Tx, query: ExportQuery, viewer: ExportViewer): Knex.QueryBuilder {
  const q = db('readings as x').leftJoin('cells as c', 'c.id', 'x.cell_id').leftJoin('masts as m', 'm.id', 'c.mast_id');
  const { techs, ...cellFilter } = query.filter;
  if (techs?.length) q.whereIn('x.tech', techs);
  whereCell(q, cellFilter);
  whereInArea(db, q, 'x.geom', query);
  if (!viewer.seesCustomers) q.whereNull('x.install_check_id');
  return q;
}

function readingsLayer(db: Tx, query: ExportQuery, viewer: ExportViewer): ExportLayerSpec {
  const q = readingsBase(db, query, viewer)
    .leftJoin('operators as o', 'o.id', 'c.operator_id')
    .select(
      'x.id',
      'x.taken_at',
      db.raw('ST_Y(x.geom) AS lat'),
      db.raw('ST_X(x.geom) AS lon'),
      'x.tech',
      'x.channel',
      'x.pci',
      'x.rsrp_dbm',
      'x.rsrq_db',
      'x.sinr_db',
      'x.rssi_dbm',
      'x.cell_id',
      db.raw('o.name AS operator'),
      'c.band',
      'c.mast_id',
      'x.device',
      'x.antenna_gain_dbi',
      'x.height_m',
      'x.source',
    )
    .orderBy('x.id');
  return {
    page: pagesOf(q, 'x.id'),
    pageable: true,
    columns: [
      'id',
      'taken_at',
      'lat',
      'lon',
      'tech',
      'channel',
      'pci',
      'rsrp_dbm',
      'rsrq_db',
      'sinr_db',
      'rssi_dbm',
      'cell_id',
      'operator',
      'band',
      'mast_id',
      'device',
      'antenna_gain_dbi',
      'height_m',
      'source',
    ],
    shape: 'point',
    placemarkName: (r) => `${String(r.tech).toUpperCase()} ${r.rsrp_dbm === null ? '' : `${r.rsrp_dbm} dBm `}${String(r.taken_at)}`.trim(),
    toRow: (r) => ({
      ...r,
      id: String(r.id),
      taken_at: iso(r.taken_at),
      cell_id: r.cell_id === null ? null : String(r.cell_id),
      mast_id: r.mast_id === null ? null : String(r.mast_id),
    }),
  };
}

/** The world as far as Web Mercator reaches: hexagons anywhere when neither bbox nor region is given. */
const WORLD: readonly [number, number, number, number] = [-180, -85, 180, 85];

/**
 * The measured signal map's hexagons (repos/reading-hexes.ts, precomputed per operator and band):
 * count and medians of RSRP, RSRQ and SINR, each hexagon's centre and outline. Homes count only
 * for roles that may see customers, as on the map.
 */
function hexagonsLayer(db: Tx, query: ExportQuery, viewer: ExportViewer, regionBbox: readonly number[] | null): ExportLayerSpec {
  const b = query.bbox;
  const rows = readingHexesQuery(db, {
    level: query.hex.level,
    bbox: b ? [b.minLon, b.minLat, b.maxLon, b.maxLat] : ((regionBbox as [number, number, number, number] | null) ?? WORLD),
    regionId: query.regionId ?? null,
    operatorId: query.hex.operatorId,
    band: query.hex.band,
    withHomeReadings: viewer.seesCustomers,
  });
  const size = getHexLevel(query.hex.level).sizeM;
  return {
    page: (limit) => db.raw('SELECT * FROM (?) t ORDER BY t.i, t.j LIMIT ?', [rows, limit]),
    pageable: false,
    columns: [
      'level',
      'hex_i',
      'hex_j',
      'lat',
      'lon',
      'readings',
      'rsrp_count',
      'median_rsrp_dbm',
      'rsrp_grade',
      'rsrq_count',
      'median_rsrq_db',
      'sinr_count',
      'median_sinr_db',
      'first_taken_at',
      'last_taken_at',
      'geometry',
    ],
    shape: 'geometry',
    placemarkName: (r) => `${r.readings} readings${r.median_rsrp_dbm === null ? '' : `, median RSRP ${Math.round(Number(r.median_rsrp_dbm))} dBm`}`,
    toRow: (r) => {
      const centre = getHexCentre(size, Number(r.i), Number(r.j));
      const { lat, lon } = fromWebMercator(centre.x, centre.y);
      const rsrp = r.rsrp_median_dbm === null ? null : Number(r.rsrp_median_dbm);
      return {
        level: Number(r.level),
        hex_i: Number(r.i),
        hex_j: Number(r.j),
        lat: Math.round(lat * 1e7) / 1e7,
        lon: Math.round(lon * 1e7) / 1e7,
        readings: Number(r.readings),
        rsrp_count: Number(r.rsrp_count),
        median_rsrp_dbm: rsrp,
        rsrp_grade: rsrp === null ? null : getSignalClass('rsrp', rsrp),
        rsrq_count: Number(r.rsrq_count),
        median_rsrq_db: r.rsrq_median_db === null ? null : Number(r.rsrq_median_db),
        sinr_count: Number(r.sinr_count),
        median_sinr_db: r.sinr_median_db === null ? null : Number(r.sinr_median_db),
        first_taken_at: iso(r.first_taken_at),
        last_taken_at: iso(r.last_taken_at),
        geometry: JSON.parse(String(r.geometry)),
      };
    },
  };
}

/** `regionBbox`: the region's [west, south, east, north], where the hexagon search starts without a bbox. */
export function getExportLayer(
  db: Tx,
  layer: ExportLayer,
  query: ExportQuery,
  viewer: ExportViewer,
  regionBbox: readonly number[] | null = null,
): ExportLayerSpec {
  switch (layer) {
    case 'masts':
      return mastsLayer(db, query);
    case 'cells':
      return cellsLayer(db, query);
    case 'readings':
      return readingsLayer(db, query, viewer);
    case 'readings-hexagons':
      return hexagonsLayer(db, query, viewer, regionBbox);
  }
}
