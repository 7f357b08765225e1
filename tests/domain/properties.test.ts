// Property-based checks of the domain maths with generated inputs (fast-check): invariants that hold
// for every input, next to the example-based checks against published values in the other files.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { getDestination, getDistanceM, getInitialBearing, getReverseBearing, normaliseBearing, wrap180 } from '../../src/lib/domain/geodesy';
import {
  findChannelsForFrequency,
  getNrArfcnForFrequency,
  getNrArfcnFrequencyMhz,
  listBands,
  lookupChannel,
  NR_ARFCN_MAX,
  type RadioTech,
} from '../../src/lib/domain/channels';
import { formatDecimal, formatDms, parseCoordinates } from '../../src/lib/domain/coords';
import {
  getCableLossPerM,
  getFreeSpaceDistanceKm,
  getFreeSpacePathLossDb,
  getSectorPatternLossDb,
  REFERENCE_CABLE_LOSS,
} from '../../src/lib/domain/link-budget';
import { analysePathProfile, getFresnelRadiusM, getKnifeEdgeLossDb, type DiffractionMethod, type ProfileSample } from '../../src/lib/domain/terrain';

const RUNS = { numRuns: 200 };

/** Positions away from the poles, where bearings are well defined. */
const position = fc.record({
  lat: fc.double({ min: -80, max: 80, noNaN: true }),
  lon: fc.double({ min: -180, max: 180, noNaN: true, maxExcluded: true }),
});
const angleDiff = (a: number, b: number) => Math.abs(wrap180(a - b));
const distanceM = fc.double({ min: 10, max: 100_000, noNaN: true });
const bearingDeg = fc.double({ min: 0, max: 360, maxExcluded: true, noNaN: true });

describe('geodesy properties', () => {
  it('normalises any bearing into [0, 360) without changing its direction', () => {
    fc.assert(
      fc.property(fc.double({ min: -1e6, max: 1e6, noNaN: true }), (deg) => {
        const n = normaliseBearing(deg);
        expect(n).toBeGreaterThanOrEqual(0);
        expect(n).toBeLessThan(360);
        expect(angleDiff(n, deg)).toBeLessThan(1e-6);
      }),
      RUNS,
    );
  });

  it('walks out along a bearing and finds the same bearing and distance back (spherical geometry)', () => {
    fc.assert(
      fc.property(position, distanceM, bearingDeg, (from, d, bearing) => {
        const to = getDestination(from, d, bearing);
        expect(getDistanceM(from, to)).toBeCloseTo(d, 3);
        expect(angleDiff(getInitialBearing(from, to), bearing)).toBeLessThan(1e-6);
      }),
      RUNS,
    );
  });

  it('the reverse bearing leads from the far end back to the start', () => {
    fc.assert(
      fc.property(position, distanceM, bearingDeg, (from, d, bearing) => {
        const to = getDestination(from, d, bearing);
        const back = getDestination(to, d, getReverseBearing(from, to));
        expect(getDistanceM(back, from)).toBeLessThan(0.01);
        // On a sphere the reverse bearing differs from forward + 180° only by the meridian convergence,
        // which is at most Δlon·sin(lat) — small over 100 km below 80°.
        expect(angleDiff(getReverseBearing(from, to), bearing + 180)).toBeLessThan(6);
      }),
      RUNS,
    );
  });
});

describe('link budget properties', () => {
  const freq = fc.double({ min: 30, max: 100_000, noNaN: true });
  const km = fc.double({ min: 0.001, max: 1000, noNaN: true });

  it('free-space loss grows with distance and with frequency (ITU-R P.525)', () => {
    fc.assert(
      fc.property(freq, km, fc.double({ min: 1.001, max: 100, noNaN: true }), (f, d, factor) => {
        const loss = getFreeSpacePathLossDb(f, d);
        expect(getFreeSpacePathLossDb(f, d * factor)).toBeGreaterThan(loss);
        expect(getFreeSpacePathLossDb(f * factor, d)).toBeGreaterThan(loss);
        // 20·log10: doubling either adds 6.02 dB
        expect(getFreeSpacePathLossDb(f, 2 * d) - loss).toBeCloseTo(20 * Math.log10(2), 9);
      }),
      RUNS,
    );
  });

  it('the distance for a loss is the inverse of the loss for a distance', () => {
    fc.assert(
      fc.property(freq, km, (f, d) => {
        expect(getFreeSpaceDistanceKm(getFreeSpacePathLossDb(f, d), f) / d).toBeCloseTo(1, 9);
      }),
      RUNS,
    );
  });

  it('cable loss per metre never falls as frequency rises, inside and outside the table', () => {
    fc.assert(
      fc.property(
        fc.constantFrom(...(Object.keys(REFERENCE_CABLE_LOSS) as Array<keyof typeof REFERENCE_CABLE_LOSS>)),
        fc.double({ min: 50, max: 6000, noNaN: true }),
        fc.double({ min: 0, max: 1000, noNaN: true }),
        (cable, f, step) => {
          const table = REFERENCE_CABLE_LOSS[cable];
          expect(getCableLossPerM(table, f + step).dbPerM).toBeGreaterThanOrEqual(getCableLossPerM(table, f).dbPerM - 1e-12);
        },
      ),
      RUNS,
    );
  });

  it('sector pattern loss grows with the offset from boresight and stops at A_m (3GPP TR 36.942 §4.2.1)', () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: 180, noNaN: true }), fc.double({ min: 0, max: 180, noNaN: true }), (a, b) => {
        const [near, far] = a <= b ? [a, b] : [b, a];
        expect(getSectorPatternLossDb(far)).toBeGreaterThanOrEqual(getSectorPatternLossDb(near));
        expect(getSectorPatternLossDb(far)).toBeLessThanOrEqual(20);
        expect(getSectorPatternLossDb(-a)).toBe(getSectorPatternLossDb(a));
      }),
      RUNS,
    );
  });
});

describe('channel number properties', () => {
  const techs: RadioTech[] = ['lte', 'nr', 'umts', 'gsm'];
  const bandAndFrequency = fc
    .constantFrom(...techs.flatMap((tech) => listBands(tech)))
    .chain((band) => fc.record({ band: fc.constant(band), mhz: fc.double({ min: band.dlMhz.low, max: band.dlMhz.high, noNaN: true }) }));

  it('every frequency inside a band finds a channel of that band, and the channel leads back to its frequency', () => {
    fc.assert(
      fc.property(bandAndFrequency, ({ band, mhz }) => {
        const hit = findChannelsForFrequency(band.tech, mhz).find((c) => c.band === band.band && c.direction !== 'UL');
        // Channel centres stop short of the band edges (by half a carrier for UMTS): only frequencies
        // beyond the first or last channel may find none.
        if (!hit) {
          const ranges = band.dlChannels;
          const firstMhz = lookupChannel(band.tech, ranges[0]!.first, { band: band.band }).dlMhz;
          const lastMhz = lookupChannel(band.tech, ranges[ranges.length - 1]!.last, { band: band.band }).dlMhz;
          expect(mhz < firstMhz || mhz > lastMhz).toBe(true);
          return;
        }
        const info = lookupChannel(band.tech, hit.channel, { band: band.band });
        expect(info.band).toBe(band.band);
        const back = findChannelsForFrequency(band.tech, info.dlMhz);
        expect(back).toContainEqual(expect.objectContaining({ band: band.band, channel: info.dlChannel, exact: true }));
        if (hit.exact) expect(info.dlMhz).toBeCloseTo(mhz, 6);
      }),
      { numRuns: 500 },
    );
  });

  it('NR-ARFCN → frequency → NR-ARFCN is the identity over the whole global raster (TS 38.104 §5.4.2.1)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: NR_ARFCN_MAX }), (n) => {
        expect(getNrArfcnForFrequency(getNrArfcnFrequencyMhz(n))).toBe(n);
      }),
      { numRuns: 1000 },
    );
  });

  it('NR-ARFCN frequencies rise with the number', () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: NR_ARFCN_MAX - 1 }), (n) => {
        expect(getNrArfcnFrequencyMhz(n + 1)).toBeGreaterThan(getNrArfcnFrequencyMhz(n));
      }),
      { numRuns: 1000 },
    );
  });
});

describe('coordinate properties', () => {
  const anywhere = fc.record({
    lat: fc.double({ min: -90, max: 90, noNaN: true }),
    lon: fc.double({ min: -180, max: 180, noNaN: true }),
  });

  it('reads back what formatDecimal writes, to its 6 decimals', () => {
    fc.assert(
      fc.property(anywhere, (p) => {
        const back = parseCoordinates(formatDecimal(p));
        expect(Math.abs(back.lat - p.lat)).toBeLessThanOrEqual(0.5e-6 + 1e-12);
        expect(Math.abs(back.lon - p.lon)).toBeLessThanOrEqual(0.5e-6 + 1e-12);
      }),
      RUNS,
    );
  });

  it('reads back what formatDms writes, to half its last second decimal', () => {
    fc.assert(
      fc.property(anywhere, fc.integer({ min: 0, max: 3 }), (p, decimals) => {
        const back = parseCoordinates(formatDms(p, decimals));
        const tolerance = (0.5 * 10 ** -decimals) / 3600 + 1e-12;
        expect(Math.abs(back.lat - p.lat)).toBeLessThanOrEqual(tolerance);
        expect(Math.abs(back.lon - p.lon)).toBeLessThanOrEqual(tolerance);
      }),
      RUNS,
    );
  });

  it('never throws anything but its own parse error on arbitrary text', () => {
    fc.assert(
      fc.property(fc.oneof(fc.string({ unit: 'binary', maxLength: 60 }), fc.stringMatching(/^[-+0-9.,;:°'"′″ NSEWnsew]{0,40}$/)), (text) => {
        try {
          const p = parseCoordinates(text);
          expect(Math.abs(p.lat)).toBeLessThanOrEqual(90);
          expect(Math.abs(p.lon)).toBeLessThanOrEqual(180);
        } catch (error) {
          expect((error as Error).name).toBe('CoordinateParseError');
        }
      }),
      { numRuns: 100 },
    );
  }, 120_000);
});

describe('terrain properties', () => {
  it('knife-edge loss J(ν) never falls as ν rises, and is 0 dB below ν = −0.78 (ITU-R P.526)', () => {
    fc.assert(
      fc.property(fc.double({ min: -10, max: 10, noNaN: true }), fc.double({ min: 0, max: 5, noNaN: true }), (nu, step) => {
        expect(getKnifeEdgeLossDb(nu + step)).toBeGreaterThanOrEqual(getKnifeEdgeLossDb(nu));
        if (nu <= -0.78) expect(getKnifeEdgeLossDb(nu)).toBe(0);
      }),
      RUNS,
    );
  });

  it('the Fresnel radius is the same from either end (ITU-R P.526 §2)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 1, max: 1e5, noNaN: true }),
        fc.double({ min: 1, max: 1e5, noNaN: true }),
        fc.double({ min: 30, max: 1e5, noNaN: true }),
        (d1, d2, f) => {
          expect(getFresnelRadiusM(d1, d2, f)).toBeCloseTo(getFresnelRadiusM(d2, d1, f), 9);
        },
      ),
      RUNS,
    );
  });

  const profile = fc.record({
    grounds: fc.array(fc.double({ min: 0, max: 300, noNaN: true }), { minLength: 3, maxLength: 24 }),
    stepM: fc.double({ min: 50, max: 2000, noNaN: true }),
    txHeightM: fc.double({ min: 1, max: 60, noNaN: true }),
    rxHeightM: fc.double({ min: 1, max: 60, noNaN: true }),
    freqMhz: fc.double({ min: 400, max: 6000, noNaN: true }),
    method: fc.constantFrom('single' as const, 'bullington' as const, 'deygout' as const),
  });
  const samplesOf = (grounds: number[], stepM: number): ProfileSample[] => grounds.map((groundM, i) => ({ distanceM: i * stepM, groundM }));

  const analyse = (p: { stepM: number; txHeightM: number; rxHeightM: number; freqMhz: number }, grounds: number[], method: DiffractionMethod) =>
    analysePathProfile({ samples: samplesOf(grounds, p.stepM), txHeightM: p.txHeightM, rxHeightM: p.rxHeightM, freqMhz: p.freqMhz, diffractionMethod: method });

  // Single knife edge and Bullington only: the Deygout sum is not monotone — raising a main edge that sits
  // below the ray lowers its sub-path edges by more than it adds (flat 200 m path, 1 m antennas, 400 MHz:
  // +1 m → −0.7 dB).
  for (const method of ['single', 'bullington'] as const) {
    it(`raising an obstacle never lowers the ${method} diffraction loss`, () => {
      fc.assert(
        fc.property(profile, fc.nat(), fc.double({ min: 0, max: 200, noNaN: true }), (p, pick, raiseM) => {
          const raised = [...p.grounds];
          const i = 1 + (pick % (raised.length - 2));
          raised[i] = raised[i]! + raiseM;
          const base = analyse(p, p.grounds, method).diffractionLossDb;
          expect(base).toBeGreaterThanOrEqual(0);
          expect(analyse(p, raised, method).diffractionLossDb).toBeGreaterThanOrEqual(base - 1e-9);
        }),
        RUNS,
      );
    });
  }

  it('the Deygout counter-example: raising the middle of a flat 200 m path lowers the Deygout sum, not Bullington', () => {
    const p = { stepM: 20, txHeightM: 1, rxHeightM: 1, freqMhz: 400 };
    const flat = Array.from({ length: 11 }, () => 0);
    const raised = flat.map((g, i) => (i === 5 ? g + 1 : g));
    expect(analyse(p, raised, 'deygout').diffractionLossDb).toBeLessThan(analyse(p, flat, 'deygout').diffractionLossDb);
    expect(analyse(p, raised, 'bullington').diffractionLossDb).toBeGreaterThan(analyse(p, flat, 'bullington').diffractionLossDb);
  });

  it('the Deygout construction never gives less loss than its own main edge alone', () => {
    fc.assert(
      fc.property(profile, (p) => {
        expect(analyse(p, p.grounds, 'deygout').diffractionLossDb).toBeGreaterThanOrEqual(analyse(p, p.grounds, 'single').diffractionLossDb - 1e-9);
      }),
      RUNS,
    );
  });

  it('gives the same answer whichever end the profile starts from', () => {
    fc.assert(
      fc.property(profile, (p) => {
        const forward = analysePathProfile({
          samples: samplesOf(p.grounds, p.stepM),
          txHeightM: p.txHeightM,
          rxHeightM: p.rxHeightM,
          freqMhz: p.freqMhz,
          diffractionMethod: p.method,
        });
        const reversed = analysePathProfile({
          samples: samplesOf([...p.grounds].reverse(), p.stepM),
          txHeightM: p.rxHeightM,
          rxHeightM: p.txHeightM,
          freqMhz: p.freqMhz,
          diffractionMethod: p.method,
        });
        expect(reversed.diffractionLossDb).toBeCloseTo(forward.diffractionLossDb, 6);
        expect(reversed.classification).toBe(forward.classification);
      }),
      RUNS,
    );
  });
});
