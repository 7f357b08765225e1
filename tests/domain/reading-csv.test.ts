import { describe, expect, it } from 'vitest';
import { buildSampleReadingCsv, checkReadingCsvHeader, checkReadingCsvRow, READING_CSV_COLUMNS, type SampleCell } from '../../src/lib/domain/reading-csv';
import { getDistanceM, getInitialBearing } from '../../src/lib/domain/geodesy';

const NOW = new Date('2026-12-01T12:00:00Z');
const base = {
  time: '2026-11-30T09:15:02Z',
  lat: '-47.21',
  lon: '-128.51',
  tech: 'lte',
  channel: '6300',
  pci: '101',
  rsrp_dbm: '-97',
  rsrq_db: '-11.5',
  sinr_db: '8',
};

describe('survey-log CSV rows', () => {
  it('types a good LTE row', () => {
    const r = checkReadingCsvRow({ ...base, mcc: '001', mnc: '01', height_m: '1.5' }, NOW);
    expect(r).toEqual({
      ok: true,
      row: expect.objectContaining({
        takenAt: new Date('2026-11-30T09:15:02Z'),
        lat: -47.21,
        lon: -128.51,
        tech: 'lte',
        channel: 6300,
        pci: 101,
        rsrpDbm: -97,
        rsrqDb: -11.5,
        sinrDb: 8,
        mcc: '001',
        mnc: '01',
        heightM: 1.5,
      }),
    });
  });

  it.each([
    // 3GPP TS 36.133 Table 9.1.4-1: LTE RSRP −140 … −44 dBm.
    [{ rsrp_dbm: '-141' }, 'LTE RSRP -141 dBm is outside -140 … -44 dBm'],
    // TS 36.133 Table 9.1.7-1: LTE RSRQ −19.5 … −3 dB.
    [{ rsrq_db: '-2' }, 'LTE RSRQ -2 dB is outside -19.5 … -3 dB'],
    // TS 38.133 §10.1.6: NR SS-RSRP down to −156 dBm, so −150 is fine for NR but not LTE.
    [{ rsrp_dbm: '-150' }, 'LTE RSRP -150 dBm is outside -140 … -44 dBm'],
    // TS 36.211 §6.11: 504 PCIs.
    [{ pci: '504' }, 'pci must be a whole number 0 … 503 for lte'],
    [{ pci: '' }, 'pci is empty'],
    [{ time: '2026-11-30 09:15' }, 'time must be ISO 8601 with a zone, e.g. 2026-11-30T09:15:02Z'],
    [{ time: '2026-12-05T09:00:00Z' }, 'time is in the future'],
    [{ lat: '91' }, 'lat must be between -90 and 90'],
    [{ mcc: '001' }, 'give mcc and mnc together, or neither'],
    [{ height_m: '400' }, 'height_m must be between 0 and 300'],
  ])('rejects %o', (change, message) => {
    const r = checkReadingCsvRow({ ...base, ...change }, NOW);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.messages).toContain(message);
  });

  it('checks the channel against the band tables (TS 36.101 Table 5.7.3-1: EARFCN 6300 is B20; 99999 is in no band)', () => {
    const r = checkReadingCsvRow({ ...base, channel: '99999' }, NOW);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.messages[0]).toMatch(/99999/);
  });

  it('accepts NR SS-RSRP below the LTE floor (TS 38.133 §10.1.6: −156 dBm)', () => {
    expect(checkReadingCsvRow({ ...base, tech: 'nr', channel: '641280', pci: '900', rsrp_dbm: '-150', rsrq_db: '', sinr_db: '' }, NOW).ok).toBe(true);
  });

  it('refuses LTE-only quantities on GSM and needs at least one measurement', () => {
    const gsm = checkReadingCsvRow({ ...base, tech: 'gsm', channel: '62', pci: '12' }, NOW);
    expect(gsm.ok).toBe(false);
    if (!gsm.ok) expect(gsm.messages).toContain('rsrp_dbm is not measured on gsm; leave it empty');
    const none = checkReadingCsvRow({ ...base, rsrp_dbm: '', rsrq_db: '', sinr_db: '' }, NOW);
    expect(none.ok).toBe(false);
  });

  it('names missing header columns', () => {
    expect(checkReadingCsvHeader(['time', 'lat', 'lon', 'tech', 'channel', 'rsrp_dbm'])).toEqual([]);
    expect(checkReadingCsvHeader(['time', 'lat'])[0]).toBe('Missing columns: lon, tech, channel (see the sample file for the column set)');
  });

  const SAMPLE_CELLS: SampleCell[] = [
    // 3GPP TS 36.101: EARFCN 6300 is B20; TS 38.104: NR-ARFCN 641280 is n78; TS 25.101: UARFCN 10700 is band I.
    { tech: 'lte', channel: 6300, pci: 101, mcc: '001', mnc: '01', lat: -47.2, lon: -128.5, sectorAzimuthDeg: 90 },
    { tech: 'nr', channel: 641280, pci: 900, mcc: '001', mnc: '02', lat: -47.25, lon: -128.55, sectorAzimuthDeg: null },
    { tech: 'umts', channel: 10700, pci: 215, mcc: '001', mnc: '03', lat: -47.3, lon: -128.6, sectorAzimuthDeg: 200 },
  ];
  const records = (csv: string) => {
    const [header, ...rows] = csv.trim().split('\n');
    expect(header!.split(',')).toEqual(READING_CSV_COLUMNS.map((c) => c.name));
    return rows.map((line) => Object.fromEntries(READING_CSV_COLUMNS.map((c, i) => [c.name, line.split(',')[i]])));
  };

  it.each([
    ['without cells', [] as SampleCell[]],
    ['made around cells', SAMPLE_CELLS],
  ])('ships a sample whose every row passes (%s)', (_label, cells) => {
    for (const record of records(buildSampleReadingCsv(cells))) expect(checkReadingCsvRow(record, NOW)).toMatchObject({ ok: true });
  });

  it('puts two readings in each given cell’s sector, 600 m and 1.5 km out, with its channel, PCI and operator', () => {
    const rows = records(buildSampleReadingCsv(SAMPLE_CELLS));
    expect(rows).toHaveLength(6);
    SAMPLE_CELLS.forEach((cell, i) => {
      for (const [k, distanceM] of [600, 1500].entries()) {
        const row = rows[i * 2 + k]!;
        expect(row).toMatchObject({ tech: cell.tech, channel: String(cell.channel), pci: String(cell.pci), mcc: cell.mcc, mnc: cell.mnc });
        const at = { lat: Number(row.lat), lon: Number(row.lon) };
        // 5 decimals of a degree are about a metre.
        expect(getDistanceM(cell, at)).toBeCloseTo(distanceM, -1);
        expect(getInitialBearing(cell, at)).toBeCloseTo(cell.sectorAzimuthDeg ?? 0, 0);
      }
    });
  });
});
