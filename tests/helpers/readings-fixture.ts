// Survey-log fixtures: an invented operator pair and masts on the demo island's waters, and CSVs
// of any length in the documented column set.
import { createOperator } from '../../src/lib/server/repos/operators';
import { createMast } from '../../src/lib/server/repos/masts';
import { createCell } from '../../src/lib/server/repos/cells';
import { CellInputSchema, MastInputSchema } from '../../src/lib/schemas/masts';
import { READING_CSV_COLUMNS } from '../../src/lib/domain/reading-csv';
import { testDb } from './db';

export interface ReadingsFixture {
  opA: string;
  opB: string;
  hill: string;
  hillCell: string;
  ridgeCell: string;
}

/** Hill (-47.2, -128.5): LTE EARFCN 6300 (B20) PCI 101 of operator 001-01. Ridge, 11 km east: same channel, PCI 101, operator 001-02. */
export async function buildReadingsFixture(): Promise<ReadingsFixture> {
  const db = testDb();
  const opA = (await createOperator(db, { name: 'Test Mobile A', mcc: '001', mnc: '01' }, null)).id;
  const opB = (await createOperator(db, { name: 'Test Mobile B', mcc: '001', mnc: '02' }, null)).id;
  const hill = (await createMast(db, MastInputSchema.parse({ name: 'Test Hill', lat: -47.2, lon: -128.5 }), null)).id;
  const ridge = (await createMast(db, MastInputSchema.parse({ name: 'Test Ridge', lat: -47.2, lon: -128.355 }), null)).id;
  const hillCell = (await createCell(db, hill, CellInputSchema.parse({ operator_id: opA, tech: 'lte', channel: 6300, pci: 101 }), null)).id;
  const ridgeCell = (await createCell(db, ridge, CellInputSchema.parse({ operator_id: opB, tech: 'lte', channel: 6300, pci: 101 }), null)).id;
  return { opA, opB, hill, hillCell, ridgeCell };
}

export const READING_HEADER = READING_CSV_COLUMNS.map((c) => c.name).join(',');

/** Row i: a reading 0–2 km west of Hill on EARFCN 6300 PCI 101, RSRP from -70 down. */
export function readingLine(i: number, overrides: Partial<Record<string, string>> = {}): string {
  const v: Record<string, string> = {
    time: new Date(Date.UTC(2026, 10, 30, 9, 0, 0) + i * 1000).toISOString(),
    lat: String(-47.2 + (i % 7) * 0.001),
    lon: String(-128.5 - (i % 11) * 0.002),
    tech: 'lte',
    channel: '6300',
    pci: '101',
    rsrp_dbm: String(-70 - (i % 50)),
    rsrq_db: '-11',
    sinr_db: '7.5',
    rssi_dbm: '',
    mcc: '',
    mnc: '',
    device: 'Test phone',
    antenna_gain_dbi: '',
    height_m: '1.5',
    ...overrides,
  };
  return READING_CSV_COLUMNS.map((c) => v[c.name]).join(',');
}

/** A CSV of `rows` readings (lines 2 … rows + 1); `bad` maps a line number to overrides for it. */
export function readingCsv(rows: number, bad: Record<number, Partial<Record<string, string>>> = {}): string {
  const lines = [READING_HEADER];
  for (let i = 0; i < rows; i++) lines.push(readingLine(i, bad[i + 2]));
  return lines.join('\n') + '\n';
}

export function csvUpload(content: string, name = 'survey.csv'): { body: FormData } {
  const form = new FormData();
  form.append('file', new File([content], name, { type: 'text/csv' }));
  return { body: form };
}
