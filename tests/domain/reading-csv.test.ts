import { describe, expect, it } from 'vitest';
import { buildSampleReadingCsv, checkReadingCsvHeader, checkReadingCsvRow, READING_CSV_COLUMNS } from '../../src/lib/domain/reading-csv';

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

  it('ships a sample whose every row passes', () => {
    const [header, ...rows] = buildSampleReadingCsv().trim().split('\n');
    expect(header!.split(',')).toEqual(READING_CSV_COLUMNS.map((c) => c.name));
    for (const line of rows) {
      const values = line.split(',');
      const record = Object.fromEntries(READING_CSV_COLUMNS.map((c, i) => [c.name, values[i]]));
      expect(checkReadingCsvRow(record, NOW)).toMatchObject({ ok: true });
    }
  });
});
