// Readings: measured samples at a place and time, optionally matched to a cell.
import type { Tx } from '../db';
import { READING, type Reading } from '../../schemas/mast-responses';
import type { Tech } from '../../schemas/mast-enums';
import type { SampleCell } from '../../domain/reading-csv';
import { recordColumns } from './record-sql';

export type { Reading };

/**
 * The latest readings matched to any of a mast's cells, newest first. Readings from install checks
 * (taken at a customer's home) only with `withInstallReadings`.
 */
export async function listRecentReadingsForMast(db: Tx, mastId: string, limit: number, withInstallReadings: boolean): Promise<Reading[]> {
  const rows: Array<Record<string, unknown>> = await db('readings as r')
    .select(recordColumns(db, READING, 'r'))
    .whereIn('r.cell_id', db('cells').select('id').where({ mast_id: mastId }))
    .modify((q) => {
      if (!withInstallReadings) q.whereNull('r.install_check_id');
    })
    .orderBy([
      { column: 'r.taken_at', order: 'desc' },
      { column: 'r.id', order: 'desc' },
    ])
    .limit(limit);
  return rows.map((r) => READING.fromRow(r));
}

/**
 * Cells to make the sample survey log around: one per operator and technology (LTE, NR, UMTS, with a
 * PCI or scrambling code) on active masts, lowest id first, at most `limit`.
 */
export async function listSampleLogCells(db: Tx, limit: number): Promise<SampleCell[]> {
  const rows: Array<{ tech: Tech; channel: number; pci: number; mcc: string; mnc: string; lat: number; lon: number; sector_azimuth_deg: number | null }> =
    await db
      .select('*')
      .from(
        db('cells as c')
          .join('masts as m', 'm.id', 'c.mast_id')
          .join('operators as o', 'o.id', 'c.operator_id')
          .distinctOn('c.operator_id', 'c.tech')
          .select(
            'c.id',
            'c.tech',
            'c.channel',
            'c.pci',
            'o.mcc',
            'o.mnc',
            'c.sector_azimuth_deg',
            db.raw('ST_Y(m.geom) AS lat'),
            db.raw('ST_X(m.geom) AS lon'),
          )
          .whereIn('c.tech', ['lte', 'nr', 'umts'])
          .whereNotNull('c.pci')
          .where('m.status', 'active')
          .orderBy(['c.operator_id', 'c.tech', 'c.id'])
          .as('one_per_operator_and_tech'),
      )
      .orderBy('id')
      .limit(limit);
  return rows.map((r) => ({
    tech: r.tech,
    channel: r.channel,
    pci: r.pci,
    mcc: r.mcc,
    mnc: r.mnc,
    lat: r.lat,
    lon: r.lon,
    sectorAzimuthDeg: r.sector_azimuth_deg,
  }));
}
