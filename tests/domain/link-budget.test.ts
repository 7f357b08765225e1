import { describe, it, expect } from 'vitest';
import {
  FSPL_CONSTANT_DB,
  REFERENCE_CABLE_LOSS,
  getCableLossDb,
  getCableLossPerM,
  getConnectorLossDb,
  getDbdFromDbi,
  getDbiFromDbd,
  getDbmFromWatts,
  getEirpDbm,
  getErpDbm,
  getFreeSpaceDistanceKm,
  getFreeSpacePathLossDb,
  getRsEpreDbm,
  getSectorPatternLossDb,
  getTwoTermCableLossDbPerM,
  getWattsFromDbm,
  interpolateGain,
  predictRsrp,
} from '../../src/lib/domain/link-budget';
import { wrap180 } from '../../src/lib/domain/geodesy';

describe('free-space path loss', () => {
  // calculated: exact constant 20·log10(4π·10⁹/c) = 32.4478 (ITU-R P.525 prints 32.4)
  it('uses the exact constant', () => {
    expect(FSPL_CONSTANT_DB).toBeCloseTo(32.4478, 4);
  });

  // ITU-R P.525 formula, calculated with the exact constant, ±0.01 dB
  it.each([
    [800, 1, 90.51],
    [1000, 1, 92.45],
    [806, 10, 110.57],
    [1800, 5, 111.53],
    [2600, 2, 106.77],
    [3500, 3, 112.87],
    [700, 30, 118.89],
  ])('%s MHz over %s km → %s dB', (f, d, loss) => {
    expect(Math.abs(getFreeSpacePathLossDb(f, d) - loss)).toBeLessThanOrEqual(0.01);
  });

  // ITU-R P.525: the printed constant 32.4 sits 0.048 dB below the exact one
  it('differs from the rounded P.525 constant by 0.048 dB', () => {
    expect(getFreeSpacePathLossDb(800, 1) - (32.4 + 20 * Math.log10(800))).toBeCloseTo(0.048, 3);
  });

  // ITU-R P.525 inverted, calculated: 120 dB at 800 MHz → 29.82 km
  it('inverts to a distance', () => {
    expect(getFreeSpaceDistanceKm(120, 800)).toBeCloseTo(29.82, 2);
    expect(getFreeSpaceDistanceKm(getFreeSpacePathLossDb(3500, 7.3), 3500)).toBeCloseTo(7.3, 9);
  });

  it.each([
    [0, 1],
    [800, 0],
    [-800, 1],
  ])('rejects f = %s MHz, d = %s km', (f, d) => {
    expect(() => getFreeSpacePathLossDb(f, d)).toThrow(RangeError);
  });
});

describe('EIRP and units', () => {
  // ITU Radio Regulations Art. 1 (e.i.r.p., e.r.p.; from memory, verify): EIRP = P + G − L; ERP = EIRP − 2.15; G(dBi) = G(dBd) + 2.15
  it('adds gain and subtracts feeder loss', () => {
    expect(getEirpDbm(15.21, 17, 0.5)).toBeCloseTo(31.71, 9);
    expect(getEirpDbm(43, 17)).toBe(60);
    expect(getErpDbm(60)).toBeCloseTo(57.85, 9);
    expect(getDbiFromDbd(0)).toBeCloseTo(2.15, 9);
    expect(getDbdFromDbi(8)).toBeCloseTo(5.85, 9);
  });

  // dBm ↔ W, calculated, to the printed precision
  it.each([
    [43, 19.95, 0.005],
    [46, 39.81, 0.005],
    [58, 631, 0.5],
    [60, 1000, 1e-9],
    [23, 0.2, 0.005],
  ])('%s dBm = %s W', (dbm, watts, tolerance) => {
    expect(Math.abs(getWattsFromDbm(dbm) - watts)).toBeLessThanOrEqual(tolerance);
    expect(getDbmFromWatts(getWattsFromDbm(dbm))).toBeCloseTo(dbm, 9);
  });

  // TS 36.101 Table 5.6-1 N_RB, calculated: 46 dBm over 20 MHz (100 RB) → RS EPRE 15.21 dBm
  it('spreads total power over the resource elements', () => {
    expect(getRsEpreDbm(46, 100)).toBeCloseTo(15.21, 2);
  });
});

describe('interpolateGain', () => {
  // common practice: catalogue gain tables, linear in frequency
  const panel = [
    { freqMhz: 1800, gainDbi: 9 },
    { freqMhz: 700, gainDbi: 7 },
    { freqMhz: 900, gainDbi: 8 },
    { freqMhz: 2700, gainDbi: 8.5 },
  ];

  it.each([
    [800, 7.5, false],
    [700, 7, false],
    [1800, 9, false],
    [2250, 8.75, false],
    [2700, 8.5, false],
    [600, 7, true],
    [3500, 8.5, true],
  ])('%s MHz → %s dBi (outside: %s)', (f, gain, outside) => {
    const result = interpolateGain(panel, f);
    expect(result.gainDbi).toBeCloseTo(gain, 9);
    expect(result.isOutsideTable).toBe(outside);
  });

  it('uses a single point as a flat gain', () => {
    expect(interpolateGain([{ freqMhz: 1800, gainDbi: 2 }], 1800)).toEqual({ gainDbi: 2, isOutsideTable: false });
    expect(interpolateGain([{ freqMhz: 1800, gainDbi: 2 }], 800)).toEqual({ gainDbi: 2, isOutsideTable: true });
  });

  it('rejects an empty table', () => {
    expect(() => interpolateGain([], 800)).toThrow(/empty/);
  });
});

describe('cable loss', () => {
  // cable-class table (two-term fits through ARRL / Codan anchors, from memory, verify, ±20 %)
  it.each([
    ['LL-10', 2600, 0.23],
    ['LL-10', 2350, 0.215],
    ['LL-10', 3500, 0.27],
    ['RG-58', 800, 0.56],
    ['RG-213', 1950, 0.445],
  ] as const)('%s at %s MHz → %s dB/m', (cable, f, dbPerM) => {
    const result = getCableLossPerM(REFERENCE_CABLE_LOSS[cable], f);
    expect(result.dbPerM).toBeCloseTo(dbPerM, 6);
    expect(result.approximate).toBe(false);
  });

  // calculated: √f scaling of 0.13 dB/m from 900 to 3500 MHz → 0.256 dB/m
  it('extrapolates above the table by √f and flags it', () => {
    const table = [
      { freqMhz: 800, dbPerM: 0.12 },
      { freqMhz: 900, dbPerM: 0.13 },
    ];
    const result = getCableLossPerM(table, 3500);
    expect(result.dbPerM).toBeCloseTo(0.256, 3);
    expect(result.approximate).toBe(true);
    const below = getCableLossPerM(table, 400);
    expect(below.dbPerM).toBeCloseTo(0.12 * Math.sqrt(0.5), 9);
    expect(below.approximate).toBe(true);
  });

  // calculated from the table, ±0.01 dB
  it('gives the total loss for a length', () => {
    expect(getCableLossDb(REFERENCE_CABLE_LOSS['RG-58'], 800, 15).lossDb).toBeCloseTo(8.4, 2);
    expect(getCableLossDb([{ freqMhz: 800, dbPerM: 0.35 }], 800, 10).lossDb).toBeCloseTo(3.5, 9);
  });

  // 10.3 mm foam datasheet formula (from memory, verify) A = 0.12229·√f + 0.00026·f dB/100 ft → 10 m at 2600 MHz 2.27 dB
  it('evaluates datasheet two-term coefficients', () => {
    expect(10 * getTwoTermCableLossDbPerM({ k1: 0.12229, k2: 0.00026 }, 2600)).toBeCloseTo(2.27, 2);
  });

  // Santa Clara County ARES/RACES coaxial-cable page (dB/100 ft at 150/450 MHz): the formulas reproduce them to ±0.05
  it.each([
    [{ k1: 0.12229, k2: 0.00026 }, 150, 1.5],
    [{ k1: 0.12229, k2: 0.00026 }, 450, 2.7],
    [{ k1: 0.24208, k2: 0.00033 }, 150, 3.0],
    [{ k1: 0.24208, k2: 0.00033 }, 450, 5.3],
  ])('%j at %s MHz ≈ %s dB/100 ft', (coefficients, f, per100Ft) => {
    expect(Math.abs(getTwoTermCableLossDbPerM(coefficients, f) * 30.48 - per100Ft)).toBeLessThanOrEqual(0.05);
  });

  // common practice, no source: 0.1–0.2 dB per mated pair
  it.each([
    [0, 0.15, 0],
    [2, 0.15, 0.3],
    [3, 0.2, 0.6],
  ])('%s connectors at %s dB → %s dB', (count, each, total) => {
    expect(getConnectorLossDb(count, each)).toBeCloseTo(total, 9);
  });

  it('defaults to 0.15 dB per connector and rejects negative counts', () => {
    expect(getConnectorLossDb(2)).toBeCloseTo(0.3, 9);
    expect(() => getConnectorLossDb(-1)).toThrow(RangeError);
  });
});

describe('getSectorPatternLossDb', () => {
  // 3GPP TR 36.942 §4.2.1 sector model (from memory, verify), calculated, ±0.01 dB
  it.each([
    [0, 0],
    [20, 1.14],
    [-20, 1.14],
    [32.5, 3.0],
    [45, 5.75],
    [60, 10.22],
    [84, 20],
    [150, 20],
  ])('%s° off boresight → %s dB', (offset, loss) => {
    expect(Math.abs(getSectorPatternLossDb(offset) - loss)).toBeLessThanOrEqual(0.01);
  });

  // TR 36.942 §4.2.1 with WGS84 case G5 (geographiclib-geodesic): mast→customer 148.0231°, sector 120° → offset 28.02° → 2.23 dB
  it('gives the G5 worked example', () => {
    const offset = wrap180(148.023098 - 120);
    expect(offset).toBeCloseTo(28.02, 2);
    expect(getSectorPatternLossDb(offset)).toBeCloseTo(2.23, 2);
  });

  // same parabola, calculated: 10° aiming error on a 40° beam ≈ 0.75 dB
  it('gives the customer aiming loss with the customer beamwidth', () => {
    expect(getSectorPatternLossDb(10, 40)).toBeCloseTo(0.75, 9);
  });
});

describe('predictRsrp', () => {
  // worked link budget (ITU-R P.525, TS 36.101 Table 5.6-1), calculated: 46 dBm/20 MHz, 17 dBi, 0.5 dB feeder, 10 km at 806 MHz,
  // 8 dBi customer, 10 m at 0.35 dB/m, 0.3 dB connectors → −74.67 dBm (±0.02 dB)
  it('reproduces the worked free-space budget', () => {
    const prediction = predictRsrp({
      freqMhz: 806,
      distanceM: 10_000,
      rsEpreDbm: getRsEpreDbm(46, 100),
      customerGainDbi: 8,
      cableLossDb: getCableLossDb([{ freqMhz: 806, dbPerM: 0.35 }], 806, 10).lossDb,
      connectorLossDb: getConnectorLossDb(2),
    });
    expect(Math.abs(prediction.rsrpDbm - -74.67)).toBeLessThanOrEqual(0.02);
    expect(prediction.rsEirpDbm).toBeCloseTo(31.71, 2);
    expect(prediction.pathLossDb).toBeCloseTo(110.57, 2);
    expect(prediction.terms.reduce((sum, t) => sum + t.db, 0)).toBeCloseTo(prediction.rsrpDbm, 9);
  });

  // common-practice defaults: RS EPRE 15.2 dBm + 17 dBi − 0.5 dB → 31.7 dBm RS EIRP
  it('applies the documented defaults and lists every term', () => {
    const prediction = predictRsrp({ freqMhz: 806, distanceM: 10_000, customerGainDbi: 8 });
    expect(prediction.rsEirpDbm).toBeCloseTo(31.7, 9);
    expect(prediction.terms.map((t) => t.key)).toEqual([
      'rsEpre',
      'mastGain',
      'mastFeeder',
      'freeSpace',
      'diffraction',
      'excess',
      'sectorPattern',
      'customerGain',
      'cable',
      'connectors',
      'calibration',
    ]);
    expect(prediction.terms.find((t) => t.key === 'mastFeeder')!.db).toBe(-0.5);
    expect(Object.is(prediction.terms.find((t) => t.key === 'cable')!.db, 0)).toBe(true);
    expect(prediction.rsrpDbm).toBeCloseTo(31.7 - 110.5745 + 8, 3);
  });

  // TR 36.942 §4.2.1 G5 sector example and the shortlist model's terrain/clutter/calibration terms
  it('subtracts sector, diffraction and excess loss and adds calibration', () => {
    const base = predictRsrp({ freqMhz: 806, distanceM: 10_000, customerGainDbi: 8 });
    const full = predictRsrp({
      freqMhz: 806,
      distanceM: 10_000,
      customerGainDbi: 8,
      sectorOffsetDeg: 28.023098,
      diffractionLossDb: 6.03,
      excessLossDb: 12,
      calibrationOffsetDb: -3,
    });
    expect(full.rsrpDbm - base.rsrpDbm).toBeCloseTo(-2.23 - 6.03 - 12 - 3, 2);
    expect(full.pathLossDb - base.pathLossDb).toBeCloseTo(18.03, 9);
    expect(full.terms.find((t) => t.key === 'sectorPattern')!.db).toBeCloseTo(-2.23, 2);
  });

  it('treats an unknown sector azimuth as on boresight', () => {
    const known = predictRsrp({ freqMhz: 1800, distanceM: 5000, customerGainDbi: 2, sectorOffsetDeg: 0 });
    const unknown = predictRsrp({ freqMhz: 1800, distanceM: 5000, customerGainDbi: 2, sectorOffsetDeg: null });
    expect(unknown.rsrpDbm).toBe(known.rsrpDbm);
  });
});
