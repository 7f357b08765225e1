// Cells that could serve a customer position, and the readings that calibrate them.
import type { Tx } from '../db';
import type { CandidateCell } from '../../domain/shortlist';
import type { LatLon } from '../../domain/geodesy';

const METRES_PER_DEGREE_LAT = 111_320;

/** A degree box (west, south, east, north) around a point that holds the whole radius. */
export function getSearchBox(p: LatLon, radiusM: number): [number, number, number, number] {
  const dLat = radiusM / METRES_PER_DEGREE_LAT;
  const dLon = radiusM / (METRES_PER_DEGREE_LAT * Math.max(0.01, Math.cos((p.lat * Math.PI) / 180)));
  return [p.lon - dLon, p.lat - dLat, p.lon + dLon, p.lat + dLat];
}

export interface CandidateQuery {
  at: LatLon;
  radiusM: number;
  operatorId?: string;
  limit: number;
}

type CandidateRow = CandidateCell & { operatorColour: string | null };

function selectCandidates(db: Tx) {
  return db('cells as c')
    .join('masts as m', 'm.id', 'c.mast_id')
    .join('operators as o', 'o.id', 'c.operator_id')
    .select(
      'c.id',
      'c.mast_id',
      'c.operator_id',
      'c.tech',
      'c.band',
      'c.channel',
      'c.dl_mhz',
      'c.pci',
      'c.sector_azimuth_deg',
      'c.antenna_height_m',
      'c.rs_power_dbm',
      'c.bandwidth_mhz',
      'm.name as mast_name',
      'm.ground_elevation_m',
      'm.structure_height_m',
      'o.name as operator_name',
      'o.colour as operator_colour',
      db.raw('ST_Y(m.geom) as lat'),
      db.raw('ST_X(m.geom) as lon'),
    );
}

// eslint-disable-next-line @typescript-eslint/no-explicit-any
function toCandidate(r: any): CandidateRow {
  return {
    cellId: String(r.id),
    mastId: String(r.mast_id),
    mastName: r.mast_name,
    mastPosition: { lat: Number(r.lat), lon: Number(r.lon) },
    mastGroundM: r.ground_elevation_m,
    operatorId: String(r.operator_id),
    operatorName: r.operator_name,
    operatorColour: r.operator_colour ?? null,
    tech: r.tech,
    band: r.band,
    channel: r.channel,
    dlMhz: Number(r.dl_mhz),
    pci: r.pci,
    sectorAzimuthDeg: r.sector_azimuth_deg,
    // Without a recorded antenna height, the structure's height is the best guess.
    antennaHeightM: r.antenna_height_m ?? r.structure_height_m ?? null,
    rsPowerDbm: r.rs_power_dbm,
    bandwidthMhz: r.bandwidth_mhz == null ? null : Number(r.bandwidth_mhz),
  };
}

/** Active masts' LTE/NR cells within the radius, nearest first (metric order via geography). */
export async function listCandidateCells(db: Tx, q: CandidateQuery): Promise<CandidateRow[]> {
  const point = db.raw('ST_SetSRID(ST_MakePoint(?, ?), 4326)', [q.at.lon, q.at.lat]);
  const rows = await selectCandidates(db)
    .where('m.status', 'active')
    .whereIn('c.tech', ['lte', 'nr'])
    .whereNotNull('c.dl_mhz')
    .whereRaw('m.geom && ST_MakeEnvelope(?, ?, ?, ?, 4326)', getSearchBox(q.at, q.radiusM))
    .whereRaw('ST_DWithin(m.geom::geography, ?::geography, ?)', [point, q.radiusM])
    .modify((b) => {
      if (q.operatorId) b.where('c.operator_id', q.operatorId);
    })
    // The cells of one mast are equally near: the id decides which of them the limit keeps, so the
    // same place always gets the same candidates (and the same co-channel neighbours).
    .orderByRaw('m.geom::geography <-> ?::geography, c.id', [point])
    .limit(q.limit);
  return rows.map(toCandidate);
}

/** One cell as a candidate (whatever its mast's status), or null when it has no frequency. */
export async function findCandidateCell(db: Tx, cellId: string): Promise<CandidateRow | null> {
  const row = await selectCandidates(db).where('c.id', cellId).whereNotNull('c.dl_mhz').first();
  return row ? toCandidate(row) : null;
}

/** A matched reading as the model residual takes it. */
export interface MeasuredReading {
  cellId: string;
  position: LatLon;
  rsrpDbm: number;
  /** Net gain of the receiving antenna and feeder; null for a device's own antenna. */
  antennaGainDbi: number | null;
  heightM: number | null;
}

/** The columns of a reading row that make a `MeasuredReading` (`lat`, `lon` read from its point). */
export interface MeasuredReadingRow {
  cell_id: string;
  lat: number;
  lon: number;
  rsrp_dbm: number;
  antenna_gain_dbi: number | null;
  height_m: number | null;
}

export function toMeasuredReading(r: MeasuredReadingRow): MeasuredReading {
  return {
    cellId: String(r.cell_id),
    position: { lat: Number(r.lat), lon: Number(r.lon) },
    rsrpDbm: Number(r.rsrp_dbm),
    antennaGainDbi: r.antenna_gain_dbi,
    heightM: r.height_m,
  };
}

export interface CellReading extends MeasuredReading {
  /** The stored model residual and what it was computed with (null until the residual job reaches it). */
  residualDb: number | null;
  residualBasis: string | null;
}

/** West, east, south, north: the order of the BETWEEN tests below. */
function boxBounds([west, south, east, north]: [number, number, number, number]): number[] {
  return [west, east, south, north];
}

/** Up to `perCell` readings of each cell nearest to a point, within a radius. */
export async function listNearbyReadings(db: Tx, cellIds: string[], at: LatLon, radiusM: number, perCell: number): Promise<CellReading[]> {
  if (cellIds.length === 0) return [];
  const { rows } = await db.raw<{ rows: Array<MeasuredReadingRow & { model_residual_db: number | null; residual_basis: string | null }> }>(
    `SELECT c.id AS cell_id, r.lat, r.lon, r.rsrp_dbm, r.antenna_gain_dbi, r.height_m, r.model_residual_db, r.residual_basis
       FROM unnest(?::bigint[]) AS c(id)
       CROSS JOIN LATERAL (
         SELECT ST_Y(geom) AS lat, ST_X(geom) AS lon, rsrp_dbm, antenna_gain_dbi, height_m, model_residual_db, residual_basis
           FROM readings
          WHERE cell_id = c.id AND rsrp_dbm IS NOT NULL
            -- Plain comparisons, not &&: a dense area's box holds far more readings than one cell
            -- has, so the cell's own index must drive the scan, not the geometry index.
            AND ST_X(geom) BETWEEN ? AND ? AND ST_Y(geom) BETWEEN ? AND ?
          -- ST_Distance rather than <->: the same order, but the planner reads the cell's own
          -- readings by index and sorts them, instead of walking every reading nearest the point.
          -- Readings taken at one spot (an install's checks) are equally near: the id decides.
          ORDER BY ST_Distance(geom, ST_SetSRID(ST_MakePoint(?, ?), 4326)), id
          LIMIT ?
       ) r`,
    [cellIds, ...boxBounds(getSearchBox(at, radiusM)), at.lon, at.lat, perCell],
  );
  return rows.map((r) => ({ ...toMeasuredReading(r), residualDb: r.model_residual_db, residualBasis: r.residual_basis }));
}

/** Cells by id as candidates (whatever their masts' status); cells without a frequency are left out. */
export async function listCandidateCellsByIds(db: Tx, cellIds: string[]): Promise<CandidateRow[]> {
  if (cellIds.length === 0) return [];
  const rows = await selectCandidates(db).whereIn('c.id', cellIds).whereNotNull('c.dl_mhz');
  return rows.map(toCandidate);
}

/**
 * A position to run a first shortlist at when a process starts: beside an active mast inside the first
 * elevation grid (so terrain is worked too), or beside any active mast; null without masts.
 */
export async function findWarmupPosition(db: Tx): Promise<LatLon | null> {
  const { rows } = await db.raw<{ rows: Array<{ lat: number; lon: number }> }>(
    `SELECT ST_Y(m.geom) AS lat, ST_X(m.geom) AS lon
       FROM masts m
       LEFT JOIN LATERAL (SELECT bounds FROM elevation_grids ORDER BY id LIMIT 1) g ON true
      WHERE m.status = 'active'
      ORDER BY (g.bounds IS NOT NULL AND m.geom && g.bounds) DESC, m.id
      LIMIT 1`,
  );
  const mast = rows[0];
  // A little way off the mast, so the paths to it and its neighbours have a length.
  return mast ? { lat: Number(mast.lat) + WARMUP_OFFSET_DEG, lon: Number(mast.lon) } : null;
}

const WARMUP_OFFSET_DEG = 0.01;
