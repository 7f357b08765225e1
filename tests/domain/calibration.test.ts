import { describe, expect, it } from 'vitest';
import { MAX_CALIBRATION_SHIFT_DB, MODEL_SPREAD_DB, getCalibration, shrinkCalibration, summariseResiduals } from '../../src/lib/domain/calibration';

describe('summariseResiduals', () => {
  it('gives count, median and sample standard deviation', () => {
    const s = summariseResiduals([3, -1, 10, 2])!;
    expect(s.count).toBe(4);
    expect(s.medianDb).toBe(2.5);
    // mean 3.5; squared deviations 0.25 + 20.25 + 42.25 + 2.25 = 65 → √(65/3) = 4.655
    expect(s.spreadDb).toBeCloseTo(4.655, 3);
    expect(summariseResiduals([5])).toEqual({ count: 1, medianDb: 5, spreadDb: null });
    expect(summariseResiduals([NaN])).toBeNull();
    expect(summariseResiduals([])).toBeNull();
  });
});

describe('shrinkage rule: w = τ² / (τ² + SE²), SE = √(π/2)·σ/√n, τ = 8 dB (common practice)', () => {
  it('moves a prediction only a little for one reading', () => {
    // n = 1, σ assumed τ = 8: SE² = (π/2)·64 = 100.53; w = 64 / 164.53 = 0.389
    const c = shrinkCalibration({ count: 1, medianDb: 20, spreadDb: null })!;
    expect(c.weight).toBeCloseTo(0.389, 3);
    expect(c.offsetDb).toBeCloseTo(7.78, 2);
    // uncertainty √(1 / (1/64 + 1/100.53)) = 6.25 dB → low
    expect(c.uncertaintyDb).toBeCloseTo(6.25, 2);
    expect(c.confidence).toBe('low');
  });

  it('uses the assumed spread for two readings, which agree too little to measure one', () => {
    // n = 2: SE² = 100.53 / 2 = 50.27; w = 64 / 114.27 = 0.560
    const c = shrinkCalibration({ count: 2, medianDb: -20, spreadDb: 0.5 })!;
    expect(c.weight).toBeCloseTo(0.56, 3);
    expect(c.offsetDb).toBeCloseTo(-11.2, 1);
  });

  it('moves almost fully for twenty agreeing readings', () => {
    // n = 20, σ = 4: SE² = (π/2)·16/20 = 1.2566; w = 64 / 65.2566 = 0.981; uncertainty 1.11 dB → high
    const c = shrinkCalibration({ count: 20, medianDb: 10, spreadDb: 4 })!;
    expect(c.weight).toBeCloseTo(0.981, 3);
    expect(c.offsetDb).toBeCloseTo(9.81, 2);
    expect(c.uncertaintyDb).toBeCloseTo(1.11, 2);
    expect(c.confidence).toBe('high');
  });

  it('trusts readings that disagree less', () => {
    const tight = shrinkCalibration({ count: 6, medianDb: 10, spreadDb: 3 })!;
    const loose = shrinkCalibration({ count: 6, medianDb: 10, spreadDb: 15 })!;
    expect(tight.offsetDb).toBeGreaterThan(loose.offsetDb);
    expect(loose.confidence).toBe('low');
  });

  it('floors a measured spread at 3 dB', () => {
    expect(shrinkCalibration({ count: 5, medianDb: 6, spreadDb: 0 })!.weight).toBeCloseTo(
      shrinkCalibration({ count: 5, medianDb: 6, spreadDb: 3 })!.weight,
      12,
    );
  });

  it('grows toward the median as readings accumulate', () => {
    const offsets = [1, 2, 3, 5, 10, 40].map((n) => shrinkCalibration({ count: n, medianDb: 12, spreadDb: 6 })!.offsetDb);
    offsets.slice(1).forEach((o, i) => expect(o).toBeGreaterThan(offsets[i]!));
    expect(offsets.at(-1)!).toBeLessThan(12);
  });

  it('never shifts more than the cap', () => {
    expect(shrinkCalibration({ count: 200, medianDb: 60, spreadDb: 3 })!.offsetDb).toBe(MAX_CALIBRATION_SHIFT_DB);
    expect(shrinkCalibration({ count: 200, medianDb: -60, spreadDb: 3 })!.offsetDb).toBe(-MAX_CALIBRATION_SHIFT_DB);
  });

  it('is nothing without readings', () => {
    expect(shrinkCalibration(null)).toBeNull();
    expect(getCalibration([])).toBeNull();
    expect(MODEL_SPREAD_DB).toBe(8);
  });

  it('summarises and shrinks in one step', () => {
    expect(getCalibration([3, -1, 10, 2])).toEqual(shrinkCalibration(summariseResiduals([3, -1, 10, 2])));
  });
});
