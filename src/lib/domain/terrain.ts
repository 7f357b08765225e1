/**
 * Terrain and propagation geometry: Fresnel zone, earth bulge, radio horizon, elevation angle, knife-edge
 * diffraction and the analysis of a sampled path profile (ITU-R P.526, P.530, P.1546; spherical geometry).
 */
import { EARTH_MEAN_RADIUS_M } from './geodesy';
import { SPEED_OF_LIGHT_M_PER_S } from './link-budget';

/** Standard effective-earth-radius factor (a_e ≈ 8500 km; ITU-R P.452/P.526 — from memory, verify). */
export const STANDARD_K_FACTOR = 4 / 3;

export function getWavelengthM(freqMhz: number): number {
  return SPEED_OF_LIGHT_M_PER_S / (freqMhz * 1e6);
}

/**
 * Radius of the n-th Fresnel zone at a point d1/d2 from the ends, R_n = √(n·λ·d1·d2/(d1 + d2)) (ITU-R P.526
 * §2). The common 17.32·√(d1·d2/(f·d)) shortcut (km, GHz) is this with c rounded to 3·10⁸ m/s.
 */
export function getFresnelRadiusM(d1M: number, d2M: number, freqMhz: number, zone = 1): number {
  if (d1M <= 0 || d2M <= 0) return 0;
  return Math.sqrt((zone * getWavelengthM(freqMhz) * d1M * d2M) / (d1M + d2M));
}

/**
 * Height of the earth's surface above the chord between two points at ground level, d1·d2/(2·k·R),
 * R = 6 371 008.8 m; k = Infinity gives a flat earth.
 */
export function getEarthBulgeM(d1M: number, d2M: number, k = STANDARD_K_FACTOR): number {
  return (d1M * d2M) / (2 * k * EARTH_MEAN_RADIUS_M);
}

/**
 * k = 157/(157 + dN/dh), dN/dh the refractivity gradient in N-units/km (ITU-R P.453 — from memory, verify).
 * At −157 N/km and below rays follow or bend into the earth (ducting): Infinity.
 */
export function getEffectiveEarthFactor(refractivityGradientPerKm: number): number {
  const denominator = 157 + refractivityGradientPerKm;
  return denominator <= 0 ? Number.POSITIVE_INFINITY : 157 / denominator;
}

/** Distance to the radio horizon, √(2·k·R·h): ≈ 4.12·√h km for k = 4/3 (h in m). */
export function getRadioHorizonKm(heightM: number, k = STANDARD_K_FACTOR): number {
  return Math.sqrt(2 * k * EARTH_MEAN_RADIUS_M * Math.max(0, heightM)) / 1000;
}

/** Longest smooth-earth line of sight between two antenna heights: the sum of their horizons. */
export function getMaxLineOfSightKm(height1M: number, height2M: number, k = STANDARD_K_FACTOR): number {
  return getRadioHorizonKm(height1M, k) + getRadioHorizonKm(height2M, k);
}

/**
 * Elevation angle (degrees, positive up) from one antenna to another, heights above a common datum
 * (ground elevation + mast height), `distanceM` along the surface. Exact spherical form with effective
 * radius R_e = k·R: θ = atan2(r2·cos γ − r1, r2·sin γ), r_i = R_e + h_i, γ = d/R_e (standard spherical geometry);
 * k = Infinity gives the flat-earth atan(Δh/d).
 */
export function getElevationAngleDeg(input: { fromHeightM: number; toHeightM: number; distanceM: number; k?: number }): number {
  const { fromHeightM, toHeightM, distanceM } = input;
  const k = input.k ?? STANDARD_K_FACTOR;
  if (!Number.isFinite(k)) return (Math.atan2(toHeightM - fromHeightM, distanceM) * 180) / Math.PI;
  const effectiveRadius = k * EARTH_MEAN_RADIUS_M;
  const gamma = distanceM / effectiveRadius;
  const r1 = effectiveRadius + fromHeightM;
  const r2 = effectiveRadius + toHeightM;
  return (Math.atan2(r2 * Math.cos(gamma) - r1, r2 * Math.sin(gamma)) * 180) / Math.PI;
}

/**
 * Where a mast's beam axis, tilted down by `downtiltDeg`, meets flat ground `heightAboveGroundM` below it:
 * Δh/tan(tilt) (plane geometry). Customers well beyond this are served by the upper part of the main lobe.
 */
export function getBeamGroundDistanceM(heightAboveGroundM: number, downtiltDeg: number): number {
  if (downtiltDeg <= 0) return Number.POSITIVE_INFINITY;
  return heightAboveGroundM / Math.tan((downtiltDeg * Math.PI) / 180);
}

/**
 * Fresnel–Kirchhoff diffraction parameter ν = h·√(2/λ·(1/d1 + 1/d2)) = √2·h/r1 for an edge `heightAboveRayM`
 * above the direct ray (negative when it lies below).
 */
export function getDiffractionParameter(heightAboveRayM: number, d1M: number, d2M: number, freqMhz: number): number {
  return (Math.SQRT2 * heightAboveRayM) / getFresnelRadiusM(d1M, d2M, freqMhz);
}

/**
 * Single knife-edge loss J(ν) = 6.9 + 20·log10(√((ν − 0.1)² + 1) + ν − 0.1) dB for ν > −0.78, else 0
 * (ITU-R P.526 approximation — from memory, verify).
 */
export function getKnifeEdgeLossDb(nu: number): number {
  if (nu <= -0.78) return 0;
  return 6.9 + 20 * Math.log10(Math.sqrt((nu - 0.1) ** 2 + 1) + nu - 0.1);
}

// ---------------------------------------------------------------------------------------------------------
// Path profile.

export interface ProfileSample {
  /** Distance from the antenna at distance 0, metres. */
  distanceM: number;
  /** Ground elevation above the datum, metres. */
  groundM: number;
  /** Trees or buildings standing on the ground here, metres; counts as obstacle. */
  clutterM?: number;
}

export interface PathProfileInput {
  /** Sorted by distance; the first at 0 m (the antenna at `txHeightM`), the last at the other antenna. */
  samples: ProfileSample[];
  /** Antenna height above the ground at distance 0, metres. */
  txHeightM: number;
  /** Antenna height above the ground at the last sample, metres. */
  rxHeightM: number;
  freqMhz: number;
  k?: number;
  /**
   * 'single': one knife edge on the worst obstacle; 'bullington': one equivalent edge where the
   * steepest tangents from both ends meet; 'deygout': main edge plus the worst edge each side.
   */
  diffractionMethod?: DiffractionMethod;
}

export interface AnalysedSample {
  distanceM: number;
  groundM: number;
  bulgeM: number;
  /** Height of the straight ray between the antennas above the datum. */
  losM: number;
  /** First Fresnel zone radius. */
  fresnelM: number;
  /** Ray height above ground + clutter + bulge (negative: the ray is blocked). */
  clearanceM: number;
  /** clearanceM / fresnelM; null at the two antennas where the zone shrinks to nothing. */
  clearanceRatio: number | null;
}

export type DiffractionMethod = 'single' | 'bullington' | 'deygout';

export interface DiffractionEdge {
  index: number;
  distanceM: number;
  nu: number;
  lossDb: number;
}

export type PathClassification = 'clear' | 'fresnel' | 'obstructed';

export interface PathProfileAnalysis {
  totalDistanceM: number;
  samples: AnalysedSample[];
  /** The interior sample with the smallest clearance/r1, or null without interior samples. */
  worst: (DiffractionEdge & { clearanceM: number; clearanceRatio: number }) | null;
  diffractionMethod: DiffractionMethod;
  diffractionLossDb: number;
  edges: DiffractionEdge[];
  classification: PathClassification;
}

/** Clearance below this fraction of r1 counts as Fresnel-zone infringement — common practice, grounded in ITU-R P.526 J(ν) ≈ 0 dB at ν ≤ −0.78. */
export const FRESNEL_CLEARANCE_RATIO = 0.6;

/**
 * Line of sight, Fresnel clearance and diffraction loss along a sampled terrain profile.
 *
 * Distance 0 is the antenna at `txHeightM`. By convention the shortlist samples from the customer (0) to
 * the mast, but the geometry is reciprocal, so either direction gives the same answer. Earth curvature
 * enters as the bulge d1·d2/(2·k·R) added to every obstacle. The two antenna sites themselves are not
 * tested as obstacles.
 */
export function analysePathProfile(input: PathProfileInput): PathProfileAnalysis {
  const { samples, txHeightM, rxHeightM, freqMhz } = input;
  const k = input.k ?? STANDARD_K_FACTOR;
  const method = input.diffractionMethod ?? 'single';
  assertProfile(samples, freqMhz);

  const first = samples[0]!;
  const last = samples[samples.length - 1]!;
  const totalM = last.distanceM;
  const txM = first.groundM + txHeightM;
  const rxM = last.groundM + rxHeightM;
  const lastIndex = samples.length - 1;

  // One pass, no intermediate arrays: the shortlist analyses a few hundred samples for every candidate.
  const analysed: AnalysedSample[] = new Array(samples.length);
  const obstacleM: number[] = new Array(samples.length);
  for (let i = 0; i < samples.length; i++) {
    const s = samples[i]!;
    const d1 = s.distanceM;
    const d2 = totalM - d1;
    const bulgeM = getEarthBulgeM(d1, d2, k);
    obstacleM[i] = s.groundM + (s.clutterM ?? 0) + bulgeM;
    const losM = txM + ((rxM - txM) * d1) / totalM;
    const fresnelM = getFresnelRadiusM(d1, d2, freqMhz);
    const clearanceM = losM - obstacleM[i]!;
    const interior = i > 0 && i < lastIndex;
    analysed[i] = {
      distanceM: d1,
      groundM: s.groundM,
      bulgeM,
      losM,
      fresnelM,
      clearanceM,
      clearanceRatio: interior && fresnelM > 0 ? clearanceM / fresnelM : null,
    };
  }

  const worst = findWorstSample(analysed);

  let edges: DiffractionEdge[];
  if (method === 'single') {
    edges = worst ? [pickEdge(worst)] : [];
  } else {
    const heights = obstacleM.map((h, i) => (i === 0 ? txM : i === lastIndex ? rxM : h));
    const distances = samples.map((s) => s.distanceM);
    edges = method === 'deygout' ? findDeygoutEdges(distances, heights, 0, lastIndex, freqMhz, 0) : findBullingtonEdge(distances, heights, freqMhz);
  }

  return {
    totalDistanceM: totalM,
    samples: analysed,
    worst,
    diffractionMethod: method,
    diffractionLossDb: edges.reduce((sum, edge) => sum + edge.lossDb, 0),
    edges: edges.sort((a, b) => a.distanceM - b.distanceM),
    classification: classifyPath(analysed),
  };
}

function findWorstSample(samples: AnalysedSample[]): PathProfileAnalysis['worst'] {
  let worstIndex = -1;
  for (let index = 0; index < samples.length; index++) {
    const ratio = samples[index]!.clearanceRatio;
    if (ratio !== null && (worstIndex < 0 || ratio < samples[worstIndex]!.clearanceRatio!)) worstIndex = index;
  }
  const sample = samples[worstIndex];
  if (!sample || sample.clearanceRatio === null) return null;
  // ν = √2·h/r1 with h = −clearance.
  const nu = -Math.SQRT2 * sample.clearanceRatio;
  return {
    index: worstIndex,
    distanceM: sample.distanceM,
    clearanceM: sample.clearanceM,
    clearanceRatio: sample.clearanceRatio,
    nu,
    lossDb: getKnifeEdgeLossDb(nu),
  };
}

function pickEdge({ index, distanceM, nu, lossDb }: DiffractionEdge): DiffractionEdge {
  return { index, distanceM, nu, lossDb };
}

function classifyPath(samples: AnalysedSample[]): PathClassification {
  let fresnel = false;
  for (const { clearanceRatio: r } of samples) {
    if (r === null) continue;
    if (r < 0) return 'obstructed';
    if (r < FRESNEL_CLEARANCE_RATIO) fresnel = true;
  }
  return fresnel ? 'fresnel' : 'clear';
}

/**
 * Bullington construction (ITU-R P.526-15 §4.5.1, the Bullington part of the method for a general
 * terrestrial path — from memory, verify the clause): when some obstacle rises above the ray, one
 * equivalent knife edge stands where the steepest tangent from each end meets the other; otherwise the
 * edge is the interior point with the largest ν. Heights already include the earth bulge. One obstacle
 * gives exactly its own knife edge, and raising any obstacle can only steepen a tangent and so never
 * lowers the loss (unlike the Deygout sum below).
 */
function findBullingtonEdge(distances: number[], heights: number[], freqMhz: number): DiffractionEdge[] {
  const last = distances.length - 1;
  if (last < 2) return [];
  const totalM = distances[last]!;
  const txM = heights[0]!;
  const rxM = heights[last]!;
  let txSlope = -Infinity;
  let rxSlope = -Infinity;
  let losEdge: DiffractionEdge | null = null;
  for (let i = 1; i < last; i++) {
    const d1 = distances[i]!;
    const d2 = totalM - d1;
    txSlope = Math.max(txSlope, (heights[i]! - txM) / d1);
    rxSlope = Math.max(rxSlope, (heights[i]! - rxM) / d2);
    const nu = getDiffractionParameter(heights[i]! - (txM + ((rxM - txM) * d1) / totalM), d1, d2, freqMhz);
    if (!losEdge || nu > losEdge.nu) losEdge = { index: i, distanceM: d1, nu, lossDb: getKnifeEdgeLossDb(nu) };
  }
  const raySlope = (rxM - txM) / totalM;
  let edge = losEdge!;
  if (txSlope >= raySlope && txSlope + rxSlope > 0) {
    const d1 = (rxM - txM + rxSlope * totalM) / (txSlope + rxSlope);
    const heightAboveRayM = txM + txSlope * d1 - (txM + raySlope * d1);
    const nu = getDiffractionParameter(heightAboveRayM, d1, totalM - d1, freqMhz);
    const index = distances.reduce((best, d, i) => (Math.abs(d - d1) < Math.abs(distances[best]! - d1) ? i : best), 1);
    edge = { index, distanceM: d1, nu, lossDb: getKnifeEdgeLossDb(nu) };
  }
  return edge.lossDb === 0 ? [] : [edge];
}

/**
 * Deygout construction: the edge with the largest ν over the whole path, then recursively the largest ν on
 * each sub-path between the antenna and that edge, here to one level (at most three edges, as ITU-R P.526
 * applies it — from memory, verify). Without P.526's empirical correction, so it can over-estimate for
 * closely spaced edges. The sum is not monotone: raising a main edge lowers the rays of its sub-paths,
 * so their edges can lose more than the main edge gains (the Bullington construction has no such step).
 */
function findDeygoutEdges(distances: number[], heights: number[], from: number, to: number, freqMhz: number, depth: number): DiffractionEdge[] {
  let best: DiffractionEdge | null = null;
  for (let i = from + 1; i < to; i++) {
    const d1 = distances[i]! - distances[from]!;
    const d2 = distances[to]! - distances[i]!;
    const rayM = heights[from]! + ((heights[to]! - heights[from]!) * d1) / (d1 + d2);
    const nu = getDiffractionParameter(heights[i]! - rayM, d1, d2, freqMhz);
    if (!best || nu > best.nu) best = { index: i, distanceM: distances[i]!, nu, lossDb: getKnifeEdgeLossDb(nu) };
  }
  if (!best || best.lossDb === 0) return [];
  if (depth >= 1) return [best];
  return [
    best,
    ...findDeygoutEdges(distances, heights, from, best.index, freqMhz, depth + 1),
    ...findDeygoutEdges(distances, heights, best.index, to, freqMhz, depth + 1),
  ];
}

function assertProfile(samples: ProfileSample[], freqMhz: number): void {
  if (samples.length < 2) throw new RangeError('A path profile needs at least two samples');
  if (samples[0]!.distanceM !== 0) throw new RangeError('The first profile sample must be at distance 0');
  for (let i = 1; i < samples.length; i++) {
    if (!(samples[i]!.distanceM > samples[i - 1]!.distanceM)) {
      throw new RangeError(`Profile distances must increase (sample ${i})`);
    }
  }
  if (samples.some((s) => !Number.isFinite(s.groundM))) throw new RangeError('Every profile sample needs a ground height');
  if (!(freqMhz > 0)) throw new RangeError('Frequency must be positive');
}
