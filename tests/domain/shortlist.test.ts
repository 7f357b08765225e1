import { describe, expect, it } from 'vitest';
import {
  assessLinkQuality,
  evaluateCandidate,
  getRankScore,
  rankShortlist,
  DEFAULT_EXCESS_LOSS_DB,
  type CandidateCell,
  type Kit,
  type ShortlistSettings,
} from '../../src/lib/domain/shortlist';
import { shrinkCalibration } from '../../src/lib/domain/calibration';
import { getDestination, getDistanceM } from '../../src/lib/domain/geodesy';
import { getFreeSpacePathLossDb } from '../../src/lib/domain/link-budget';
import { getDeclination } from '../../src/lib/domain/declination';
import type { ProfileSample } from '../../src/lib/domain/terrain';

// Hand-built fixture (invented): a customer on flat ground at 100 m, a mast 6 km due north behind a
// 60 m ridge, and a mast 11 km due east with clear ground.
const customer = { lat: -47.2, lon: -128.5 };
const northMast = getDestination(customer, 6000, 0);
const eastMast = getDestination(customer, 11_000, 90);

const cell = (id: string, pos: typeof customer, azimuth: number, overrides: Partial<CandidateCell> = {}): CandidateCell => ({
  cellId: id,
  mastId: `m${id}`,
  mastName: `Mast ${id}`,
  mastPosition: pos,
  mastGroundM: 100,
  operatorId: '1',
  operatorName: 'Op one',
  tech: 'lte',
  band: 'B20',
  channel: 6300,
  dlMhz: 806,
  pci: 10,
  sectorAzimuthDeg: azimuth,
  antennaHeightM: 30,
  rsPowerDbm: 15.2,
  ...overrides,
});

const flat = (lengthM: number, n = 30): ProfileSample[] => Array.from({ length: n + 1 }, (_, i) => ({ distanceM: (lengthM * i) / n, groundM: 100 }));
const ridge = (lengthM: number, n = 30): ProfileSample[] =>
  flat(lengthM, n).map((s) => (Math.abs(s.distanceM - lengthM / 2) <= lengthM / n ? { ...s, groundM: 160 } : s));

/** The same gain across 700–2700 MHz. */
const flatGain = (gainDbi: number) => [700, 2700].map((freqMhz) => ({ freqMhz, gainDbi }));

// Common-practice demo kit: 8 dBi panel, 0.35 dB/m cable, 2 dBi stub for "before".
const kit: Kit = {
  antenna: {
    id: 'a1',
    name: 'Panel',
    gainTable: flatGain(8),
    horizontalBeamwidthDeg: 40,
  },
  cable: {
    id: 'c1',
    name: 'Cable',
    lossTable: [700, 2700].map((freqMhz) => ({ freqMhz, dbPerM: 0.35 })),
    connectorLossDb: 0.15,
    connectors: 2,
  },
  cableM: 10,
  mountHeightM: 10,
};
const stub: Kit = {
  antenna: {
    id: 'a0',
    name: 'Stub',
    gainTable: flatGain(2),
    horizontalBeamwidthDeg: null,
  },
  cable: null,
  cableM: 0,
  mountHeightM: 2,
};

const settings: ShortlistSettings = { customer, customerGroundM: 100, date: new Date('2026-06-01T00:00:00Z'), kit, currentKit: stub };

describe('shortlist', () => {
  // Sector azimuths point each cell at the customer (mast north → sector 180°, mast east → 270°).
  const north = evaluateCandidate(cell('N', northMast, 180), { profile: ridge(6000), calibration: null }, settings);
  // With a 10 m mount, the east mast's antennas at 45 m keep 0.6 of the first Fresnel zone clear over 11 km.
  const east = evaluateCandidate(cell('E', eastMast, 270, { antennaHeightM: 45 }), { profile: flat(11_000), calibration: null }, settings);

  it('sees the Fresnel zone infringed on the same flat path with lower mast antennas', () => {
    const low = evaluateCandidate(cell('E', eastMast, 270), { profile: flat(11_000), calibration: null }, settings);
    // 10 m and 30 m over 11 km: mid-path ray 20 m − bulge 1.78 m < 0.6 × r1 (32.0 m at 806 MHz) — ITU-R P.526 §2, 60 % clearance common practice
    expect(low.terrain.status).toBe('fresnel');
  });

  it('ranks a farther clear mast above a nearer one behind a ridge', () => {
    expect(north.terrain.status).toBe('obstructed');
    expect(north.terrain.diffractionLossDb).toBeGreaterThan(10);
    expect(east.terrain.status).toBe('clear');
    expect(east.terrain.diffractionLossDb).toBe(0);
    expect(rankShortlist([north, east]).map((e) => e.cell.cellId)).toEqual(['E', 'N']);
  });

  it('gives the geometry of each candidate', () => {
    expect(north.distanceM).toBeCloseTo(6000, 0);
    expect(north.bearingTrueDeg).toBeCloseTo(0, 3);
    expect(north.bearingFromMastDeg).toBeCloseTo(180, 3);
    expect(north.sectorOffsetDeg).toBeCloseTo(0, 3);
    // Turf's east destination follows the great circle, so the bearing back is close to 270°.
    expect(Math.abs(east.bearingTrueDeg - 90)).toBeLessThan(0.1);
    expect(east.bearingMagneticDeg).toBeCloseTo((((east.bearingTrueDeg - east.declinationDeg) % 360) + 360) % 360, 9);
  });

  it('gives the same entry when the caller passes the declination it worked out once for the shortlist', () => {
    // One customer and date have one declination (WMM2025), so a shortlist computes it once for all its cells.
    const declinationDeg = getDeclination({ lat: customer.lat, lon: customer.lon, date: settings.date });
    const given = evaluateCandidate(cell('N', northMast, 180), { profile: ridge(6000), calibration: null }, { ...settings, declinationDeg });
    expect(given).toEqual(north);
    expect(given.declinationDeg).toBe(declinationDeg);
  });

  it('sums the link budget of the shortlist model for a clear path', () => {
    // RS EPRE 15.2 + 17 dBi − 0.5 feeder (common practice) − FSPL (ITU-R P.525) − excess + 8 dBi − 3.5 dB cable − 0.3 dB connectors
    const d = getDistanceM(customer, eastMast) / 1000;
    const expected = 15.2 + 17 - 0.5 - getFreeSpacePathLossDb(806, d) - DEFAULT_EXCESS_LOSS_DB + 8 - 3.5 - 0.3;
    // (to 0.001 dB: the bearing back from the east mast is a few hundredths of a degree off its sector axis)
    expect(east.predictedRsrpDbm).toBeCloseTo(expected, 3);
    expect(east.prediction.terms.reduce((s, t) => s + t.db, 0)).toBeCloseTo(east.predictedRsrpDbm, 9);
  });

  it('expects the kit to gain its antenna advantage minus cable losses over the stub', () => {
    expect(east.expectedGainDb).toBeCloseTo(8 - 3.5 - 0.3 - 2, 6);
  });

  it('grades the prediction with the RSRP grades', () => {
    expect(['excellent', 'good', 'fair', 'poor', 'unusable']).toContain(east.grade);
  });

  it('loses sector pattern gain off the sector axis (3GPP TR 36.942 §4.2.1 pattern: 60° → −10.22 dB)', () => {
    const offAxis = evaluateCandidate(cell('E2', eastMast, 330, { antennaHeightM: 45 }), { profile: flat(11_000), calibration: null }, settings);
    expect(offAxis.sectorOffsetDeg).toBeCloseTo(-60, 0);
    expect(east.predictedRsrpDbm - offAxis.predictedRsrpDbm).toBeCloseTo(10.22, 1);
  });

  it('applies calibration and the preferred operator to the rank', () => {
    const calibrated = evaluateCandidate(
      cell('N', northMast, 180),
      { profile: ridge(6000), calibration: shrinkCalibration({ count: 12, medianDb: 18.5, spreadDb: 2 }) },
      settings,
    );
    expect(calibrated.predictedRsrpDbm - north.predictedRsrpDbm).toBeCloseTo(calibrated.calibration!.offsetDb, 9);
    expect(calibrated.calibration!.offsetDb).toBeGreaterThan(18);
    const preferNorth = { ...settings, preferredOperatorId: '2' };
    const n2 = evaluateCandidate(
      cell('N', northMast, 180, { operatorId: '2' }),
      { profile: ridge(6000), calibration: null },
      { ...preferNorth, operatorPreferenceDb: 40 },
    );
    const e2 = evaluateCandidate(cell('E', eastMast, 270, { antennaHeightM: 45 }), { profile: flat(11_000), calibration: null }, preferNorth);
    expect(rankShortlist([e2, n2])[0].cell.cellId).toBe('N');
  });

  it('warns when no elevation data covers the path', () => {
    const bare = evaluateCandidate(cell('E', eastMast, 270), { profile: null, calibration: null }, settings);
    expect(bare.terrain.status).toBe('unknown');
    expect(bare.warnings.join(' ')).toMatch(/terrain not checked/);
  });
});

describe('SINR, throughput and the rank score', () => {
  // Two sectors of one mast 220 m north, both on the customer's channel: the customer sits on their edge.
  const nearMast = getDestination(customer, 220, 0);
  const edgeA = cell('A', nearMast, 150, { pci: 1 });
  const edgeB = cell('B', nearMast, 210, { pci: 2 });
  // A clean sector 3 km east on another channel of the same operator.
  const farMast = getDestination(customer, 3000, 90);
  const clean = cell('C', farMast, 270, { channel: 1300, dlMhz: 1815, band: 'B3', pci: 3, bandwidthMhz: 20 });
  const entries = [edgeA, edgeB, clean].map((c) => evaluateCandidate(c, { profile: null, calibration: null }, settings));
  const assessed = assessLinkQuality(entries, { sinr: { neighbourLoad: 1 } });

  it("counts only the same operator's cells on the same channel as interference", () => {
    const [a, b, c] = assessed;
    expect(a!.interferers).toBe(1);
    expect(b!.interferers).toBe(1);
    expect(c!.interferers).toBe(0);
    // Equal-strength co-channel sectors at full load: SINR ≈ 0 dB (noise is far below −60 dBm).
    expect(a!.sinrDb).toBeCloseTo(a!.predictedRsrpDbm - b!.predictedRsrpDbm, 1);
    expect(a!.warnings.join(' ')).toMatch(/Sector edge/);
    expect(c!.warnings.join(' ')).not.toMatch(/Sector edge/);
  });

  it('ranks the clean sector 3 km away above the sector edge 220 m from the mast', () => {
    const [a, , c] = assessed;
    expect(a!.predictedRsrpDbm).toBeGreaterThan(c!.predictedRsrpDbm);
    expect(rankShortlist(assessed)[0]!.cell.cellId).toBe('C');
    expect(c!.expectedThroughputMbps!).toBeGreaterThan(a!.expectedThroughputMbps!);
  });

  it('scores RSRP up to −80 dBm plus SINR within the Annex A range, plus the preference', () => {
    expect(getRankScore(-70, 10)).toBe(-80 + 10);
    expect(getRankScore(-95, 30)).toBeCloseTo(-95 + 22.05, 2);
    expect(getRankScore(-95, -30)).toBe(-95 - 10);
    expect(getRankScore(-95, 5, 6)).toBe(-84);
  });

  it('warns when the feeder loses more than the antenna gains and when the kit is worse than today', () => {
    const stubOnFeeder: Kit = {
      ...kit,
      antenna: {
        ...kit.antenna,
        name: 'Stub',
        gainTable: flatGain(2),
      },
      cableM: 25,
    };
    const e = evaluateCandidate(cell('E', eastMast, 270), { profile: null, calibration: null }, { ...settings, kit: stubOnFeeder });
    // 25 m × 0.35 dB/m + 2 × 0.15 dB = 9.05 dB > 2 dBi (common-practice cable figure)
    expect(e.warnings.join(' ')).toMatch(/loses 9\.1 dB .* more than Stub gains/);
    expect(e.expectedGainDb!).toBeLessThan(0);
    expect(e.warnings.join(' ')).toMatch(/less than Stub: the install would make the signal worse/);
  });
});
