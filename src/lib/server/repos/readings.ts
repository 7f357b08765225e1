// Readings: measured samples at a place and time, optionally matched to a cell.
import type { Tx } from '../db';
import type { ReadingJson, Tech } from '../../schemas/masts';

export interface Reading {
  id: string;
  takenAt: Date;
  lat: number;
  lon: number;
  tech: Tech;
  channel: number | null;
  pci: number | null;
  rsrpDbm: number | null;
  rsrqDb: number | null;
  sinrDb: number | null;
  rssiDbm: number | null;
  cellId: string | null;
  device: string | null;
  source: string | null;
}

/** Rows as selected: the response fields with the time as a Date. */
type ReadingRow = Omit<ReadingJson, 'taken_at'> & { taken_at: Date };

function toReading(r: ReadingRow): Reading {
  return {
    id: String(r.id),
    takenAt: r.taken_at,
    lat: r.lat,
    lon: r.lon,
    tech: r.tech,
    channel: r.channel,
    pci: r.pci,
    rsrpDbm: r.rsrp_dbm,
    rsrqDb: r.rsrq_db,
    sinrDb: r.sinr_db,
    rssiDbm: r.rssi_dbm,
    cellId: r.cell_id === null ? null : String(r.cell_id),
    device: r.device,
    source: r.source,
  };
}

export function readingJson(r: Reading): ReadingJson {
  return {
    id: r.id,
    taken_at: r.takenAt.toISOString(),
    lat: r.lat,
    lon: r.lon,
    tech: r.tech,
    channel: r.channel,
    pci: r.pci,
    rsrp_dbm: r.rsrpDbm,
    rsrq_db: r.rsrqDb,
    sinr_db: r.sinrDb,
    rssi_dbm: r.rssiDbm,
    cell_id: r.cellId,
    device: r.device,
    source: r.source,
  };
}

/**
 * The latest readings matched to any of a mast's cells, newest first. Readings from install checks
 * (taken at a customer's home) only with `withInstallReadings`.
 */
export async function listRecentReadingsForMast(db: Tx, mastId: string, limit: number, withInstallReadings: boolean): Promise<Reading[]> {
  const rows: ReadingRow[] = await db('readings as r')
    .select(
      'r.id',
      'r.taken_at',
      db.raw('ST_Y(r.geom) AS lat'),
      db.raw('ST_X(r.geom) AS lon'),
      'r.tech',
      'r.channel',
      'r.pci',
      'r.rsrp_dbm',
      'r.rsrq_db',
      'r.sinr_db',
      'r.rssi_dbm',
      'r.cell_id',
      'r.device',
      'r.source',
    )
    .whereIn('r.cell_id', db('cells').select('id').where({ mast_id: mastId }))
    .modify((q) => {
      if (!withInstallReadings) q.whereNull('r.install_check_id');
    })
    .orderBy([
      { column: 'r.taken_at', order: 'desc' },
      { column: 'r.id', order: 'desc' },
    ])
    .limit(limit);
  return rows.map(toReading);
}
