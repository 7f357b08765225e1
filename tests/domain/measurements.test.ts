import { describe, it, expect } from 'vitest';
import {
  estimateRsrpFromRssi,
  estimateRssiFromRsrp,
  getLteResourceBlockCount,
  getMeasurementRange,
  getNrResourceBlockCount,
  getReportIndex,
  getReportInterval,
  getRsrqDb,
  getRssiFromCsq,
  getThermalNoiseDbm,
  getWorstGrade,
  gradeSignal,
  validateMeasurement,
  type MeasurementKind,
} from '../../src/lib/domain/measurements';

describe('validateMeasurement', () => {
  // reporting ranges (TS 36.133 §9.1.4/§9.1.7, TS 38.133 §10.1.6/10.1.11/10.1.16, AOSP HAL)
  it.each([
    ['lteRsrp', -140, true],
    ['lteRsrp', -44, true],
    ['lteRsrp', -140.5, false],
    ['lteRsrp', -43, false],
    ['lteRsrq', -19.5, true],
    ['lteRsrq', -3, true],
    ['lteRsrq', -20, false],
    ['lteRsrq', -2.5, false],
    ['lteSinr', -20, true],
    ['lteSinr', 30, true],
    ['lteSinr', 31, false],
    ['lteRssi', -65, true],
    ['lteRssi', -5, false],
    ['nrSsRsrp', -156, true],
    ['nrSsRsrp', -31, true],
    ['nrSsRsrp', -157, false],
    ['nrSsRsrp', -30, false],
    ['nrSsRsrq', -43, true],
    ['nrSsRsrq', 20, true],
    ['nrSsRsrq', 20.5, false],
    ['nrSsSinr', -23, true],
    ['nrSsSinr', 40, true],
    ['nrSsSinr', -23.5, false],
  ] as [MeasurementKind, number, boolean][])('%s %s → ok %s', (kind, value, ok) => {
    expect(validateMeasurement(kind, value).ok).toBe(ok);
  });

  it('explains a rejected value', () => {
    expect(validateMeasurement('lteRsrp', -150)).toEqual({ ok: false, message: 'LTE RSRP -150 dBm is outside -140 … -44 dBm' });
    expect(validateMeasurement('nrSsSinr', Number.NaN)).toEqual({ ok: false, message: 'NR SS-SINR must be a number' });
  });

  // TS 36.133 extended LTE ranges (RSRP to −156 dBm; RSRQ −34 … +2.5 dB), details from memory, verify
  it.each([
    ['lteRsrp', -150, true],
    ['lteRsrp', -157, false],
    ['lteRsrq', -34, true],
    ['lteRsrq', 2.5, true],
    ['lteRsrq', 3, false],
  ] as [MeasurementKind, number, boolean][])('extended %s %s → ok %s', (kind, value, ok) => {
    expect(validateMeasurement(kind, value, { extended: true }).ok).toBe(ok);
  });

  it('leaves quantities without an extended table unchanged', () => {
    expect(getMeasurementRange('nrSsRsrp', { extended: true })).toMatchObject({ min: -156, max: -31 });
  });
});

describe('report indices', () => {
  // TS 36.133 Tables 9.1.4-1 and 9.1.7-1, calculated check values
  it.each([
    ['lteRsrp', 0, null, -140],
    ['lteRsrp', 45, -96, -95],
    ['lteRsrp', 62, -79, -78],
    ['lteRsrp', 97, -44, null],
    ['lteRsrq', 1, -19.5, -19],
    ['lteRsrq', 20, -10, -9.5],
    ['lteRsrq', 34, -3, null],
    // NR index formulas (TS 38.133; end rows from memory, verify)
    ['nrSsRsrp', 1, -156, -155],
    ['nrSsRsrp', 126, -31, null],
    ['nrSsRsrq', 1, -43, -42.5],
    ['nrSsRsrq', 127, 20, null],
    ['nrSsSinr', 0, null, -23],
    ['nrSsSinr', 127, 40, null],
  ] as const)('%s index %s → [%s, %s)', (kind, index, lower, upper) => {
    expect(getReportInterval(kind, index)).toEqual({ lower, upper });
  });

  it.each([
    ['lteRsrp', -95.5, 45],
    ['lteRsrp', -141, 0],
    ['lteRsrp', -30, 97],
    ['lteRsrq', -9.75, 20],
    ['nrSsSinr', 0, 47],
  ] as const)('%s value %s is reported as index %s', (kind, value, index) => {
    expect(getReportIndex(kind, value)).toBe(index);
  });

  it.each([-1, 98, 1.5])('rejects RSRP index %s', (index) => {
    expect(() => getReportInterval('lteRsrp', index)).toThrow(RangeError);
  });
});

describe('RSRP, RSSI and RSRQ', () => {
  // TS 36.101 §5.6 Table 5.6-1: the transmission bandwidth (N_RB × 180 kHz) takes nine tenths of a
  // 3–20 MHz channel (15 RB in 3 MHz … 100 RB in 20 MHz) and 1.08 MHz (6 RB) of a 1.4 MHz one.
  it.each([3, 5, 10, 15, 20])('%s MHz carries resource blocks filling nine tenths of the channel', (bw) => {
    expect(getLteResourceBlockCount(bw) * 0.18).toBeCloseTo(0.9 * bw, 9);
  });

  it('1.4 MHz carries 6 resource blocks (1.08 MHz)', () => {
    expect(getLteResourceBlockCount(1.4)).toBe(6);
  });

  it('rejects a bandwidth LTE does not define', () => {
    expect(() => getLteResourceBlockCount(7)).toThrow(/1.4, 3, 5, 10, 15, 20/);
  });

  // NR N_RB (TS 38.104 Table 5.3.2-1)
  it.each([
    [20, 15, 106],
    [50, 15, 270],
    [100, 30, 273],
    [40, 30, 106],
  ] as const)('NR %s MHz at %s kHz carries %s RB', (bw, scs, rb) => {
    expect(getNrResourceBlockCount(bw, scs)).toBe(rb);
  });

  // rule of thumb RSRP ≈ RSSI − 10·log10(12·N_RB) from the TS 36.214 definitions, calculated (±0.01 dB)
  it.each([
    [-60, 20, -90.79],
    [-70, 10, -97.78],
    [-75, 5, -99.77],
  ])('RSSI %s dBm over %s MHz → RSRP ≈ %s dBm', (rssi, bw, rsrp) => {
    expect(estimateRsrpFromRssi(rssi, bw)).toBeCloseTo(rsrp, 2);
    expect(estimateRssiFromRsrp(rsrp, bw)).toBeCloseTo(rssi, 2);
  });

  // TS 36.214 §5.1.3: exact RSRQ = 10·log10(N) + RSRP − RSSI; and ≈ −10.79 dB at full uniform load
  it.each([
    [-95, -65, 50, -13.01],
    [-90.79, -60, 100, -10.79],
  ])('RSRP %s, RSSI %s, N %s → RSRQ %s dB', (rsrp, rssi, n, rsrq) => {
    expect(getRsrqDb(rsrp, rssi, n)).toBeCloseTo(rsrq, 2);
  });

  // kT at 290 K, calculated: thermal noise per 15 kHz RE −132.24 dBm; with a 7 dB noise figure −125.24 dBm
  it.each([
    [0, -132.24],
    [7, -125.24],
  ])('noise in 15 kHz with NF %s dB → %s dBm', (nf, dbm) => {
    expect(getThermalNoiseDbm(15_000, nf)).toBeCloseTo(dbm, 2);
  });

  // +CSQ mapping (TS 27.007 §8.5, from memory, verify)
  it.each([
    [0, -113],
    [31, -51],
    [15, -83],
    [99, null],
  ])('CSQ %s → %s dBm', (csq, dbm) => {
    expect(getRssiFromCsq(csq)).toBe(dbm);
  });

  it('rejects an impossible CSQ', () => {
    expect(() => getRssiFromCsq(40)).toThrow(RangeError);
  });
});

describe('gradeSignal', () => {
  // common practice, no source; boundaries inclusive on the better side
  it.each([
    ['lteRsrp', -85, 'good'],
    ['lteRsrp', -100, 'fair'],
    ['lteRsrp', -80, 'excellent'],
    ['lteRsrp', -90, 'good'],
    ['lteRsrp', -100.1, 'poor'],
    ['lteRsrp', -110, 'poor'],
    ['lteRsrp', -115, 'unusable'],
    ['nrSsRsrp', -70, 'excellent'],
    ['lteRsrq', -12, 'good'],
    ['lteRsrq', -10, 'excellent'],
    ['lteRsrq', -19, 'fair'],
    ['lteRsrq', -21, 'poor'],
    ['lteSinr', 25, 'excellent'],
    ['lteSinr', 13, 'good'],
    ['lteSinr', 5, 'fair'],
    ['lteSinr', -2, 'poor'],
    ['nrSsSinr', 0, 'fair'],
  ] as [MeasurementKind, number, string][])('%s %s → %s', (kind, value, grade) => {
    expect(gradeSignal(kind, value)).toBe(grade);
  });

  it('has no grades for RSSI', () => {
    expect(() => gradeSignal('lteRssi', -60)).toThrow(/no quality grades/);
  });

  it('summarises by the worst grade', () => {
    expect(getWorstGrade(['good', 'poor', 'excellent'])).toBe('poor');
    expect(getWorstGrade(['excellent'])).toBe('excellent');
    expect(getWorstGrade([])).toBeNull();
  });
});
