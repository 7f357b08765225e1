import { describe, expect, it } from 'vitest';
import {
  getExpectedThroughputMbps,
  getMimoFactor,
  getNoisePowerDbm,
  getSinrAtMaxEfficiencyDb,
  getSinrDb,
  getSpectralEfficiency,
} from '../../src/lib/domain/link-quality';

describe('noise power kT₀B + NF', () => {
  // k = 1.380649e-23 J/K (SI 2019, exact), T₀ = 290 K → 10·log10(kT₀) + 30 = −173.976 dBm/Hz; 15 kHz resource element (TS 36.211 §6.2.3)
  it.each([
    [1, 0, -173.976],
    [15_000, 0, -132.215],
    [15_000, 7, -125.215],
    [15_000, 9, -123.215],
    [10e6, 7, -96.976],
  ])('%d Hz with NF %d dB → %d dBm', (hz, nf, dbm) => {
    expect(getNoisePowerDbm(hz, nf)).toBeCloseTo(dbm, 2);
  });

  it('rejects a bandwidth that is not positive', () => {
    expect(() => getNoisePowerDbm(0)).toThrow(RangeError);
  });
});

describe('SINR', () => {
  it('serving −80 dBm, one co-channel neighbour −90 dBm at full load, NF 7 dB → 10.00 dB (hand-worked: 10·log10(1e-8 / (1e-9 + 10^-12.52)))', () => {
    expect(getSinrDb(-80, [-90], { neighbourLoad: 1, noiseFigureDb: 7 })).toBeCloseTo(9.9987, 3);
  });

  it('halves the interference at half load and sums neighbours in milliwatts', () => {
    // 1e-8 / (0.5·2e-9 + 10^-12.522) → 9.997 dB (two −90 dBm neighbours at load 0.5 equal one at full load)
    expect(getSinrDb(-80, [-90, -90], { neighbourLoad: 0.5, noiseFigureDb: 7 })).toBeCloseTo(9.9987, 3);
  });

  it('is the signal-to-noise ratio without neighbours', () => {
    expect(getSinrDb(-110, [], { noiseFigureDb: 7 })).toBeCloseTo(15.215, 2);
  });

  it('rejects a load outside 0…1', () => {
    expect(() => getSinrDb(-80, [-90], { neighbourLoad: 1.5 })).toThrow(RangeError);
  });
});

describe('throughput by the attenuated Shannon bound (3GPP TR 36.942 Annex A, downlink α 0.6, −10 dB, 4.4 bit/s/Hz)', () => {
  it.each([
    [10, 2.076],
    [-5, 0.238],
    [-10, 0.6 * Math.log2(1.1)],
    [0, 0.6],
    [30, 4.4],
  ])('SINR %d dB → %d bit/s/Hz', (sinr, se) => {
    expect(getSpectralEfficiency(sinr)).toBeCloseTo(se, 3);
  });

  it('gives nothing below SINR_MIN', () => {
    expect(getSpectralEfficiency(-10.01)).toBe(0);
  });

  it('reaches its cap at 2^(4.4/0.6) − 1 = 160.3 → 22.05 dB', () => {
    expect(getSinrAtMaxEfficiencyDb()).toBeCloseTo(22.05, 2);
    expect(getSpectralEfficiency(22.05)).toBeCloseTo(4.4, 3);
  });

  it('turns SE into Mbit/s over the carrier after 25 % overhead (common practice)', () => {
    // 2.076 bit/s/Hz × 20 MHz × 0.75 = 31.14 Mbit/s with one port
    expect(getExpectedThroughputMbps(10, 20)).toBeCloseTo(31.14, 1);
    // 4.4 × 10 MHz × 0.75 × 2 (2×2 MIMO at high SINR) = 66 Mbit/s
    expect(getExpectedThroughputMbps(25, 10, { ports: 2 })).toBeCloseTo(66, 6);
  });

  it('adds MIMO gain only with a good SINR', () => {
    expect(getMimoFactor(0, 2)).toBe(1);
    expect(getMimoFactor(12.5, 2)).toBe(1.5);
    expect(getMimoFactor(25, 2)).toBe(2);
    expect(getMimoFactor(25, 1)).toBe(1);
  });

  it('grows with SINR', () => {
    const rates = [-12, -5, 0, 5, 10, 15, 20, 25].map((s) => getExpectedThroughputMbps(s, 10, { ports: 2 }));
    rates.slice(1).forEach((r, i) => expect(r).toBeGreaterThanOrEqual(rates[i]!));
  });
});
