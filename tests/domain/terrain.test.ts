import { describe, it, expect } from 'vitest';
import {
  analysePathProfile,
  getBeamGroundDistanceM,
  getDiffractionParameter,
  getEarthBulgeM,
  getEffectiveEarthFactor,
  getElevationAngleDeg,
  getFresnelRadiusM,
  getKnifeEdgeLossDb,
  getMaxLineOfSightKm,
  getRadioHorizonKm,
  type ProfileSample,
} from '../../src/lib/domain/terrain';

const R = 6_371_008.8;

describe('getFresnelRadiusM', () => {
  // ITU-R P.530 §2.2.2 17.32 shortcut (from memory, verify), calculated (exact λ form differs ≤ 0.01 m), ±0.02 m
  it.each([
    [10, 5, 0.8, 30.62, 18.37],
    [5, 2.5, 1.8, 14.43, 8.66],
    [2, 1, 3.5, 6.55, 3.93],
    [20, 2, 0.7, 27.77, 16.66],
    [10, 5, 2.6, 16.98, 10.19],
    [15, 7.5, 2.1, 23.14, 13.89],
  ])('D %s km, d1 %s km, %s GHz → r1 %s m', (dKm, d1Km, fGhz, r1, r60) => {
    const radius = getFresnelRadiusM(d1Km * 1000, (dKm - d1Km) * 1000, fGhz * 1000);
    expect(Math.abs(radius - r1)).toBeLessThanOrEqual(0.02);
    expect(Math.abs(0.6 * radius - r60)).toBeLessThanOrEqual(0.02);
  });

  // ITU-R P.526 §2: R_n = √(n·λ·d1·d2/d) grows with √n
  it('scales higher zones by √n and vanishes at the ends', () => {
    expect(getFresnelRadiusM(5000, 5000, 800, 2)).toBeCloseTo(Math.SQRT2 * getFresnelRadiusM(5000, 5000, 800), 9);
    expect(getFresnelRadiusM(0, 10_000, 800)).toBe(0);
  });
});

describe('earth bulge and k', () => {
  // earth bulge d1·d2/(2kR), calculated, ±0.01 m
  it.each([
    [5, 5, 4 / 3, 1.47],
    [10, 10, 4 / 3, 5.89],
    [15, 15, 4 / 3, 13.25],
    [25, 25, 4 / 3, 36.79],
    [2, 8, 4 / 3, 0.94],
    [5, 5, 1, 1.96],
  ])('d1 %s km, d2 %s km, k %s → %s m', (d1, d2, k, bulge) => {
    expect(Math.abs(getEarthBulgeM(d1 * 1000, d2 * 1000, k) - bulge)).toBeLessThanOrEqual(0.01);
  });

  it('is zero on a flat earth (k = ∞)', () => {
    expect(getEarthBulgeM(5000, 5000, Number.POSITIVE_INFINITY)).toBe(0);
  });

  // k = 157/(157 + dN/dh) (ITU-R P.453, from memory, verify)
  it.each([
    [-40, 1.342],
    [0, 1],
    [-100, 2.754],
    [-157, Number.POSITIVE_INFINITY],
    [-200, Number.POSITIVE_INFINITY],
  ])('dN/dh %s N/km → k %s', (gradient, k) => {
    if (Number.isFinite(k)) expect(getEffectiveEarthFactor(gradient)).toBeCloseTo(k, 3);
    else expect(getEffectiveEarthFactor(gradient)).toBe(k);
  });
});

describe('radio horizon', () => {
  // radio horizon √(2kRh) = 4.12·√h (k = 4/3), calculated, ±0.02 km
  it.each([
    [2, 5.83],
    [6, 10.09],
    [10, 13.03],
    [30, 22.57],
    [50, 29.13],
    [100, 41.2],
  ])('h %s m → %s km', (h, km) => {
    expect(Math.abs(getRadioHorizonKm(h) - km)).toBeLessThanOrEqual(0.02);
  });

  // ITU-R P.1546 eq. (39b) form: mast 40 m + customer 8 m → 4.12·(6.325 + 2.828) = 37.71 km
  it('adds both horizons for the longest line of sight', () => {
    expect(Math.abs(getMaxLineOfSightKm(40, 8) - 37.71)).toBeLessThanOrEqual(0.02);
  });

  // calculated: geometric horizon (k = 1) 3.57·√h
  it('is shorter without refraction', () => {
    expect(getRadioHorizonKm(100, 1)).toBeCloseTo(35.7, 1);
    expect(getRadioHorizonKm(-5)).toBe(0);
  });
});

describe('getElevationAngleDeg', () => {
  // spherical geometry, calculated (R = 6 371 008.8 m; exact form), ±0.001°
  it.each([
    [8, 48, 10, 0.2292, 0.1955, 0.1842],
    [10, 40, 2, 0.8594, 0.8526, 0.8504],
    [5, 35, 1, 1.7184, 1.715, 1.7139],
    [6, 156, 5, 1.7184, 1.7015, 1.6959],
    [200, 180, 25, -0.0458, -0.1301, -0.1583],
    [8, 48, 30, 0.0764, -0.0248, -0.0585],
  ])('customer %s m, mast %s m, %s km → flat %s°, k=4/3 %s°, k=1 %s°', (hc, hm, dKm, flat, k43, k1) => {
    const base = { fromHeightM: hc, toHeightM: hm, distanceM: dKm * 1000 };
    expect(Math.abs(getElevationAngleDeg({ ...base, k: Number.POSITIVE_INFINITY }) - flat)).toBeLessThanOrEqual(0.001);
    expect(Math.abs(getElevationAngleDeg(base) - k43)).toBeLessThanOrEqual(0.001);
    expect(Math.abs(getElevationAngleDeg({ ...base, k: 1 }) - k1)).toBeLessThanOrEqual(0.001);
    // calculated: the approximation atan(Δh/d) − d/(2kR) agrees to 10⁻⁴°
    const approx = ((Math.atan((hm - hc) / (dKm * 1000)) - (dKm * 1000) / (2 * (4 / 3) * R)) * 180) / Math.PI;
    expect(Math.abs(getElevationAngleDeg(base) - approx)).toBeLessThan(1e-4);
  });

  it('is symmetric in sign when looking back', () => {
    const up = getElevationAngleDeg({ fromHeightM: 8, toHeightM: 48, distanceM: 2000, k: Number.POSITIVE_INFINITY });
    const down = getElevationAngleDeg({ fromHeightM: 48, toHeightM: 8, distanceM: 2000, k: Number.POSITIVE_INFINITY });
    expect(down).toBeCloseTo(-up, 12);
  });
});

describe('getBeamGroundDistanceM', () => {
  // plane geometry: 40 m and 4° downtilt → 572 m
  it('places the beam axis on the ground', () => {
    expect(getBeamGroundDistanceM(40, 4)).toBeCloseTo(572, 0);
    expect(getBeamGroundDistanceM(40, 0)).toBe(Number.POSITIVE_INFINITY);
  });
});

describe('getKnifeEdgeLossDb', () => {
  // ITU-R P.526 J(ν) (from memory, verify), calculated, ±0.02 dB
  it.each([
    [-0.849, 0],
    [-0.5, 1.96],
    [0, 6.03],
    [0.5, 10.29],
    [1, 13.93],
    [2.4, 20.54],
    [-0.78, 0],
    [-3, 0],
  ])('ν %s → %s dB', (nu, loss) => {
    expect(Math.abs(getKnifeEdgeLossDb(nu) - loss)).toBeLessThanOrEqual(0.02);
  });

  // ν = √2·h/r1: 0.6·r1 clearance gives ν ≈ −0.85
  it('relates clearance to ν = √2·h/r1', () => {
    const r1 = getFresnelRadiusM(5000, 5000, 800);
    expect(getDiffractionParameter(-0.6 * r1, 5000, 5000, 800)).toBeCloseTo(-0.6 * Math.SQRT2, 9);
  });
});

/** Flat ground at 0 m every `stepM` over `totalM`, with optional changes. */
function flatProfile(totalM: number, stepM: number, changes: Record<number, Partial<ProfileSample>> = {}): ProfileSample[] {
  const samples: ProfileSample[] = [];
  for (let d = 0; d <= totalM; d += stepM) samples.push({ distanceM: d, groundM: 0, ...changes[d] });
  return samples;
}

describe('analysePathProfile', () => {
  const midR1 = getFresnelRadiusM(5000, 5000, 800);
  const midBulge = getEarthBulgeM(5000, 5000);

  // calculated: 10 km at 800 MHz, midpoint r1 ≈ 30.6 m, bulge 1.47 m (k = 4/3)
  it('computes bulge, ray, Fresnel radius and clearance per sample', () => {
    const result = analysePathProfile({ samples: flatProfile(10_000, 5000), txHeightM: 20, rxHeightM: 20, freqMhz: 800 });
    const [start, mid, end] = result.samples;
    expect(result.totalDistanceM).toBe(10_000);
    expect(mid!.bulgeM).toBeCloseTo(1.47, 2);
    expect(mid!.losM).toBe(20);
    expect(mid!.fresnelM).toBeCloseTo(30.61, 2);
    expect(mid!.clearanceM).toBeCloseTo(20 - 1.4715, 3);
    expect(mid!.clearanceRatio).toBeCloseTo((20 - midBulge) / midR1, 9);
    expect(start).toMatchObject({ losM: 20, fresnelM: 0, clearanceRatio: null, bulgeM: 0 });
    expect(end).toMatchObject({ losM: 20, fresnelM: 0, clearanceRatio: null });
    expect(result.classification).toBe('clear');
    expect(result.diffractionLossDb).toBe(0);
  });

  // common practice: clearance below 0.6·r1 infringes the Fresnel zone; the loss follows J(ν)
  it('classifies partial Fresnel clearance and charges J(ν)', () => {
    const result = analysePathProfile({ samples: flatProfile(10_000, 5000), txHeightM: 10, rxHeightM: 10, freqMhz: 800 });
    const ratio = (10 - midBulge) / midR1;
    expect(result.classification).toBe('fresnel');
    expect(result.worst).toMatchObject({ index: 1, distanceM: 5000 });
    expect(result.worst!.nu).toBeCloseTo(-Math.SQRT2 * ratio, 9);
    expect(result.diffractionLossDb).toBeCloseTo(getKnifeEdgeLossDb(-Math.SQRT2 * ratio), 9);
    expect(result.diffractionLossDb).toBeGreaterThan(2);
  });

  // ITU-R P.526 J(ν) values placed on a hill at mid-path: ν = 0 → 6.03, 0.5 → 10.29, 1 → 13.93, −0.5 → 1.96
  it.each([
    [0, 6.03, 'fresnel'], // grazing: the ray touches the edge but is not blocked
    [0.5, 10.29, 'obstructed'],
    [1, 13.93, 'obstructed'],
    [-0.5, 1.96, 'fresnel'],
  ])('a mid-path edge at ν %s costs %s dB (%s)', (nu, loss, classification) => {
    // Edge top above the ray: h = ν·r1/√2; the ray is at 20 m, the bulge adds to the ground.
    const edgeTop = 20 + (nu * midR1) / Math.SQRT2;
    const samples = flatProfile(10_000, 1000, { 5000: { groundM: edgeTop - midBulge } });
    const result = analysePathProfile({ samples, txHeightM: 20, rxHeightM: 20, freqMhz: 800 });
    expect(result.worst!.distanceM).toBe(5000);
    expect(result.worst!.nu).toBeCloseTo(nu, 9);
    expect(Math.abs(result.diffractionLossDb - loss)).toBeLessThanOrEqual(0.02);
    expect(result.classification).toBe(classification);
  });

  it('treats clutter on the ground as an obstacle', () => {
    const bare = analysePathProfile({ samples: flatProfile(4000, 500), txHeightM: 10, rxHeightM: 30, freqMhz: 1800 });
    const wooded = analysePathProfile({
      samples: flatProfile(4000, 500, { 1000: { clutterM: 15 } }),
      txHeightM: 10,
      rxHeightM: 30,
      freqMhz: 1800,
    });
    expect(bare.classification).toBe('clear');
    expect(wooded.classification).toBe('obstructed');
    expect(wooded.worst!.distanceM).toBe(1000);
  });

  // calculated: k = 1 bulge 1.96 m vs 1.47 m at k = 4/3 for 5 + 5 km
  it('uses more bulge with a smaller k', () => {
    const input = { samples: flatProfile(10_000, 5000), txHeightM: 20, rxHeightM: 20, freqMhz: 800 };
    expect(analysePathProfile({ ...input, k: 1 }).samples[1]!.bulgeM).toBeCloseTo(1.96, 2);
    expect(analysePathProfile({ ...input, k: 1 }).samples[1]!.clearanceM).toBeCloseTo(20 - 1.962, 2);
  });

  it('is reciprocal: the reversed profile gives the same classification and loss', () => {
    const samples = flatProfile(8000, 500, { 3000: { groundM: 25 }, 3500: { groundM: 18 } });
    const forward = analysePathProfile({ samples, txHeightM: 6, rxHeightM: 40, freqMhz: 2600 });
    const reversed = analysePathProfile({
      samples: [...samples].reverse().map((s) => ({ ...s, distanceM: 8000 - s.distanceM })),
      txHeightM: 40,
      rxHeightM: 6,
      freqMhz: 2600,
    });
    expect(reversed.classification).toBe(forward.classification);
    expect(reversed.diffractionLossDb).toBeCloseTo(forward.diffractionLossDb, 9);
    expect(reversed.worst!.distanceM).toBe(8000 - forward.worst!.distanceM);
  });

  // ITU-R P.526 Deygout construction on two hills (flat earth, 300 MHz): main edge + one edge each side
  it('adds the worst edge on each side of the main edge with the Deygout method', () => {
    const samples = flatProfile(10_000, 1000, { 3000: { groundM: 20 }, 7000: { groundM: 15 } });
    const input = { samples, txHeightM: 10, rxHeightM: 10, freqMhz: 300, k: Number.POSITIVE_INFINITY };
    const single = analysePathProfile(input);
    const deygout = analysePathProfile({ ...input, diffractionMethod: 'deygout' });

    const main = getDiffractionParameter(10, 3000, 7000, 300); // 20 m edge, ray at 10 m
    const right = getDiffractionParameter(15 - (20 - (10 * 4000) / 7000), 4000, 3000, 300); // ray from edge top to rx
    const left = getDiffractionParameter(-(10 + 10 / 3), 1000, 2000, 300); // ground at 1 km under the tx→edge ray
    expect(single.edges.map((e) => e.distanceM)).toEqual([3000]);
    expect(single.diffractionLossDb).toBeCloseTo(getKnifeEdgeLossDb(main), 9);
    expect(deygout.edges.map((e) => e.distanceM)).toEqual([1000, 3000, 7000]);
    expect(deygout.diffractionLossDb).toBeCloseTo(getKnifeEdgeLossDb(main) + getKnifeEdgeLossDb(right) + getKnifeEdgeLossDb(left), 9);
    expect(deygout.diffractionLossDb).toBeGreaterThan(single.diffractionLossDb);
  });

  // ITU-R P.526-15 §4.5.1 Bullington construction (from memory, verify the clause) on the same two hills,
  // worked by hand: tangent slopes from tx 10/3000, from rx 5/3000 → they meet at d1 = (5/3000·10000)/(15/3000)
  // = 3333.3 m, 10/3000·3333.3 = 11.11 m above the level ray.
  it('puts one equivalent edge where the steepest tangents from both ends meet with the Bullington method', () => {
    const samples = flatProfile(10_000, 1000, { 3000: { groundM: 20 }, 7000: { groundM: 15 } });
    const input = { samples, txHeightM: 10, rxHeightM: 10, freqMhz: 300, k: Number.POSITIVE_INFINITY };
    const bullington = analysePathProfile({ ...input, diffractionMethod: 'bullington' });
    const nu = getDiffractionParameter(100 / 9, 10_000 / 3, 20_000 / 3, 300);
    expect(bullington.edges).toHaveLength(1);
    expect(bullington.edges[0]!.distanceM).toBeCloseTo(10_000 / 3, 6);
    expect(bullington.edges[0]!.index).toBe(3);
    expect(bullington.edges[0]!.nu).toBeCloseTo(nu, 9);
    expect(bullington.diffractionLossDb).toBeCloseTo(getKnifeEdgeLossDb(nu), 9);
    // One obstacle: the tangents meet on it, so the equivalent edge is that knife edge.
    const one = flatProfile(10_000, 1000, { 3000: { groundM: 20 } });
    const single = analysePathProfile({ ...input, samples: one });
    const oneEdge = analysePathProfile({ ...input, samples: one, diffractionMethod: 'bullington' });
    expect(oneEdge.diffractionLossDb).toBeCloseTo(single.diffractionLossDb, 9);
    expect(oneEdge.edges[0]!.distanceM).toBeCloseTo(3000, 9);
    // Below the ray: the interior point with the largest ν, as for a single knife edge.
    const clear = analysePathProfile({ ...input, txHeightM: 40, rxHeightM: 40, diffractionMethod: 'bullington' });
    const clearSingle = analysePathProfile({ ...input, txHeightM: 40, rxHeightM: 40 });
    expect(clear.diffractionLossDb).toBeCloseTo(clearSingle.diffractionLossDb, 9);
  });

  it('handles a profile with only the two antenna sites', () => {
    const result = analysePathProfile({
      samples: [
        { distanceM: 0, groundM: 50 },
        { distanceM: 3000, groundM: 80 },
      ],
      txHeightM: 5,
      rxHeightM: 30,
      freqMhz: 800,
    });
    expect(result.worst).toBeNull();
    expect(result.classification).toBe('clear');
    expect(result.samples[1]!.losM).toBe(110);
  });

  it.each([
    [[{ distanceM: 0, groundM: 0 }], /at least two/],
    [
      [
        { distanceM: 10, groundM: 0 },
        { distanceM: 20, groundM: 0 },
      ],
      /distance 0/,
    ],
    [
      [
        { distanceM: 0, groundM: 0 },
        { distanceM: 0, groundM: 0 },
      ],
      /must increase/,
    ],
    [
      [
        { distanceM: 0, groundM: 0 },
        { distanceM: 10, groundM: Number.NaN },
      ],
      /ground height/,
    ],
  ])('rejects a malformed profile %#', (samples, message) => {
    expect(() => analysePathProfile({ samples, txHeightM: 5, rxHeightM: 30, freqMhz: 800 })).toThrow(message);
  });
});
