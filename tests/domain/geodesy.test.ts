import { describe, it, expect } from 'vitest';
import geodesic from 'geographiclib-geodesic';
import {
  getBearingLine,
  interpolatePointsAlong,
  getDestination,
  getDistanceM,
  getInitialBearing,
  getReverseBearing,
  listPointsAlong,
  normaliseBearing,
  wrap180,
  type LatLon,
} from '../../src/lib/domain/geodesy';

const wgs84 = geodesic.Geodesic.WGS84;

/** Smallest absolute difference between two bearings, in degrees. */
function bearingGap(a: number, b: number): number {
  return Math.abs(wrap180(a - b));
}

function dms(deg: number, min: number, sec: number): number {
  const sign = deg < 0 || Object.is(deg, -0) ? -1 : 1;
  return sign * (Math.abs(deg) + min / 60 + sec / 3600);
}

// Deterministic PRNG (mulberry32) so the random pairs are the same on every run.
function createRandom(seed: number): () => number {
  let state = seed >>> 0;
  return () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

describe('normaliseBearing', () => {
  // common practice: bearings live in [0, 360)
  it.each([
    [0, 0],
    [360, 0],
    [-90, 270],
    [725, 5],
    [-720, 0],
    [359.9999, 359.9999],
    [-1e-15, 0],
    [-0, 0],
  ])('maps %s° to %s°', (input, expected) => {
    const result = normaliseBearing(input);
    expect(result).toBeCloseTo(expected, 9);
    expect(result).toBeGreaterThanOrEqual(0);
    expect(result).toBeLessThan(360);
    expect(Object.is(result, -0)).toBe(false);
  });
});

describe('wrap180', () => {
  it.each([
    [190, -170],
    [-190, 170],
    [180, -180],
    [0, 0],
    [540, -180],
    [28.02, 28.02],
    [359, -1],
  ])('maps %s° to %s°', (input, expected) => {
    expect(wrap180(input)).toBeCloseTo(expected, 9);
  });
});

// WGS84 (NGA.STND.0036) inverse-problem cases G1–G12 generated with geographiclib-geodesic 2.2.0, with the
// spherical columns (haversine R = 6 371 008.8 m, spherical initial bearing).
const wgs84Cases = [
  { id: 'G1', a: [52, -1], b: [52.009, -1], s12: 1001.407, azi1: 0, back: 180, haversine: 1000.756, sphBearing: 0 },
  { id: 'G2', a: [52.2053, 0.1218], b: [52.24, 0.18], s12: 5543.139, azi1: 45.825423, back: 225.871424, haversine: 5532.139, sphBearing: 45.7531 },
  { id: 'G3', a: [48, 11], b: [48, 11.1341], s12: 10007.259, azi1: 89.950172, back: 270.049828, haversine: 9977.579, sphBearing: 89.9502 },
  { id: 'G4', a: [45.764, 4.8357], b: [45.66, 4.7], s12: 15660.711, azi1: 222.478893, back: 42.381754, haversine: 15644.331, sphBearing: 222.3853 },
  { id: 'G5', a: [44.53461, -109.05572], b: [44.7, -109.2], s12: 21654.523, azi1: 328.124435, back: 148.023098, haversine: 21647.719, sphBearing: 328.212 },
  { id: 'G6', a: [-35.2809, 149.13], b: [-35.05, 149], s12: 28222.209, azi1: 335.149888, back: 155.22476, haversine: 28263.885, sphBearing: 335.2478 },
  { id: 'G7', a: [40, -3.7], b: [40.27, -3.7], s12: 29980.052, azi1: 0, back: 180, haversine: 30022.672, sphBearing: 0 },
  { id: 'G8', a: [53, -8], b: [53.3, -7.45], s12: 49685.953, azi1: 47.562332, back: 228.002449, haversine: 49578.175, sphBearing: 47.4933 },
  { id: 'G9', a: [64.8, 179.7], b: [64.9, -179.8], s12: 26209.39, azi1: 64.599019, back: 245.051618, haversine: 26113.951, sphBearing: 64.5722 },
  { id: 'G10', a: [89.5, 30], b: [89.6, -150], s12: 100524.56, azi1: 0, back: 0, haversine: 100075.572, sphBearing: 0 },
  { id: 'G11', a: [0, 0], b: [0, 1], s12: 111319.491, azi1: 90, back: 270, haversine: 111195.08, sphBearing: 90 },
  {
    id: 'G12',
    a: [51.4778, -0.0015],
    b: [40.7128, -74.006],
    s12: 5594596.514,
    azi1: 288.470473,
    back: 51.245353,
    haversine: 5579565.617,
    sphBearing: 288.4313,
  },
].map((c) => ({ ...c, from: { lat: c.a[0]!, lon: c.a[1]! }, to: { lat: c.b[0]!, lon: c.b[1]! } }));

describe('distance and bearings against the WGS84 check cases', () => {
  // cases G1–G12: spherical distance within 0.6 % of the ellipsoidal geodesic
  it.each(wgs84Cases)('$id: distance within 0.6 % of geographiclib s12', ({ from, to, s12 }) => {
    expect(Math.abs(getDistanceM(from, to) - s12) / s12).toBeLessThan(0.006);
  });

  // haversine R = 6 371 008.8 m column: same sphere, so agreement to the printed millimetre
  it.each(wgs84Cases)('$id: distance equals the haversine column', ({ from, to, haversine }) => {
    expect(getDistanceM(from, to)).toBeCloseTo(haversine, 2);
  });

  // spherical initial bearing column (printed to 4 decimals)
  it.each(wgs84Cases)('$id: initial bearing equals the spherical column', ({ from, to, sphBearing }) => {
    expect(bearingGap(getInitialBearing(from, to), sphBearing)).toBeLessThan(0.00006);
  });

  // geographiclib-geodesic: geodesic azi1 and the pt2→pt1 bearing (azi2 ± 180°); sphere within 0.2°
  it.each(wgs84Cases)('$id: customer→mast and mast→customer bearings within 0.2° of the geodesic', ({ from, to, azi1, back }) => {
    expect(bearingGap(getInitialBearing(from, to), azi1)).toBeLessThan(0.2);
    expect(bearingGap(getReverseBearing(from, to), back)).toBeLessThan(0.2);
  });

  // geographiclib-geodesic: the reverse bearing is not the forward bearing + 180° (G12: 51.25° vs 108.47°)
  it('computes the reverse bearing from the other end, not as forward + 180°', () => {
    const g12 = wgs84Cases.find((c) => c.id === 'G12')!;
    const reverse = getReverseBearing(g12.from, g12.to);
    expect(bearingGap(reverse, 51.245353)).toBeLessThan(0.2);
    expect(bearingGap(reverse, normaliseBearing(getInitialBearing(g12.from, g12.to) + 180))).toBeGreaterThan(50);
  });

  it('gives 0 m and a finite bearing for identical points', () => {
    const p = { lat: 52, lon: -1 };
    expect(getDistanceM(p, p)).toBe(0);
    expect(Number.isFinite(getInitialBearing(p, p))).toBe(true);
  });
});

// Vincenty 1975 Table II lines (a)–(e) (Survey Review 23(176)) — on Bessel 1841 / International 1924, so only
// loose agreement is expected from a sphere; the long and near-antipodal lines must simply not break.
const vincentyLines = [
  { line: 'a', phi1: dms(55, 45, 0), phi2: -dms(33, 26, 0), L: dms(108, 13, 0), s: 14110526.17, alpha1: dms(96, 36, 8.7996) },
  { line: 'b', phi1: dms(37, 19, 54.95367), phi2: dms(26, 7, 42.83946), L: dms(41, 28, 35.50729), s: 4085966.703, alpha1: dms(95, 27, 59.63089) },
  { line: 'c', phi1: dms(35, 16, 11.24862), phi2: dms(67, 22, 14.77638), L: dms(137, 47, 28.31435), s: 8084823.839, alpha1: dms(15, 44, 23.7485) },
  { line: 'd', phi1: dms(1, 0, 0), phi2: -dms(0, 59, 53.83076), L: dms(179, 17, 48.02997), s: 19960000, alpha1: dms(89, 0, 0) },
  { line: 'e', phi1: dms(1, 0, 0), phi2: dms(1, 1, 15.18952), L: dms(179, 46, 17.84244), s: 19780006.558, alpha1: dms(4, 59, 59.99995) },
];

describe('Vincenty 1975 Table II lines', () => {
  // Vincenty 1975 Table II: spherical distance within 0.6 % of s
  it.each(vincentyLines)('line ($line): distance within 0.6 % and finite bearings', ({ phi1, phi2, L, s }) => {
    const from = { lat: phi1, lon: 0 };
    const to = { lat: phi2, lon: L };
    expect(Math.abs(getDistanceM(from, to) - s) / s).toBeLessThan(0.006);
    expect(Number.isFinite(getInitialBearing(from, to))).toBe(true);
    expect(Number.isFinite(getReverseBearing(from, to))).toBe(true);
  });

  // Vincenty 1975 Table II lines (b), (c): short enough for the spherical bearing to stay within 0.5°
  it.each(vincentyLines.filter((l) => l.line === 'b' || l.line === 'c'))('line ($line): initial bearing near the published α1', ({ phi1, phi2, L, alpha1 }) => {
    expect(bearingGap(getInitialBearing({ lat: phi1, lon: 0 }, { lat: phi2, lon: L }), alpha1)).toBeLessThan(0.5);
  });

  // Vincenty 1975 Table II: the bearing line must be drawable even for the long lines
  it.each(vincentyLines)('line ($line): bearing line starts and ends at the two points', ({ phi1, phi2, L }) => {
    const line = getBearingLine({ lat: phi1, lon: 0 }, { lat: phi2, lon: L });
    const coords = line.geometry.coordinates;
    expect(coords[0]).toEqual([0, phi1]);
    expect(coords[coords.length - 1]![1]).toBeCloseTo(phi2, 9);
    expect(wrap180(coords[coords.length - 1]![0]! - L)).toBeCloseTo(0, 9);
    for (const [lon, lat] of coords) {
      expect(Number.isFinite(lon)).toBe(true);
      expect(Math.abs(lat!)).toBeLessThanOrEqual(90);
    }
  });
});

describe('random short lines against geographiclib', () => {
  // geographiclib-geodesic WGS84 as the oracle; 400 seeded pairs up to 100 km at |lat| ≤ 70°
  const random = createRandom(20250101);
  const pairs = Array.from({ length: 400 }, (_, i) => {
    const lat1 = -70 + 140 * random();
    const lon1 = -180 + 360 * random();
    const azi = 360 * random();
    const s = 10 ** (1 + 4 * random()); // 10 m … 100 km, log-uniform
    const direct = wgs84.Direct(lat1, lon1, azi, s);
    return { i, from: { lat: lat1, lon: lon1 }, to: { lat: direct.lat2!, lon: direct.lon2! } };
  });

  it.each(pairs)('pair $i: distance within 0.6 %, bearings within 0.2°', ({ from, to }) => {
    const inverse = wgs84.Inverse(from.lat, from.lon, to.lat, to.lon);
    const s12 = inverse.s12!;
    expect(Math.abs(getDistanceM(from, to) - s12) / s12).toBeLessThan(0.006);
    expect(bearingGap(getInitialBearing(from, to), inverse.azi1!)).toBeLessThan(0.2);
    expect(bearingGap(getReverseBearing(from, to), inverse.azi2! + 180)).toBeLessThan(0.2);
  });
});

describe('getDestination', () => {
  // direct-problem checks generated with geographiclib-geodesic 2.2.0; a sphere lands within 0.6 % of the distance from the geodesic point
  it.each([
    { origin: { lat: 52, lon: -1 }, azi: 45, s: 10_000, geodesicEnd: { lat: 52.06350483, lon: -0.89689433 } },
    { origin: { lat: -35.2809, lon: 149.13 }, azi: 200, s: 25_000, geodesicEnd: { lat: -35.49260563, lon: 149.03576701 } },
  ])('lands near the geodesic end point for $s m at $azi°', ({ origin, azi, s, geodesicEnd }) => {
    const end = getDestination(origin, s, azi);
    expect(getDistanceM(end, geodesicEnd)).toBeLessThan(0.006 * s);
    expect(getDistanceM(origin, end)).toBeCloseTo(s, 3);
    expect(bearingGap(getInitialBearing(origin, end), azi)).toBeLessThan(1e-6);
  });

  // case G9: crossing the antimeridian keeps longitude in [−180, 180)
  it('wraps the longitude across the antimeridian', () => {
    const end = getDestination({ lat: 64.8, lon: 179.7 }, 26_113.951, 64.5722);
    expect(end.lon).toBeCloseTo(-179.8, 3);
    expect(end.lat).toBeCloseTo(64.9, 3);
  });
});

describe('getBearingLine', () => {
  it('is a LineString whose ends are the two points', () => {
    const from = { lat: 52.2053, lon: 0.1218 };
    const to = { lat: 52.24, lon: 0.18 };
    const line = getBearingLine(from, to, { npoints: 10 });
    expect(line.type).toBe('Feature');
    expect(line.geometry.type).toBe('LineString');
    expect(line.geometry.coordinates).toHaveLength(10);
    expect(line.geometry.coordinates[0]).toEqual([0.1218, 52.2053]);
    expect(line.geometry.coordinates[9]).toEqual([0.18, 52.24]);
  });

  // case G9: across the antimeridian the line stays continuous (no 360° jump)
  it('unwraps longitudes across the antimeridian (G9)', () => {
    const line = getBearingLine({ lat: 64.8, lon: 179.7 }, { lat: 64.9, lon: -179.8 });
    const coords = line.geometry.coordinates;
    for (let i = 1; i < coords.length; i++) {
      expect(Math.abs(coords[i]![0]! - coords[i - 1]![0]!)).toBeLessThan(1);
    }
    expect(coords[coords.length - 1]![0]).toBeCloseTo(180.2, 9);
    expect(coords[coords.length - 1]![1]).toBeCloseTo(64.9, 9);
  });

  // case G10: over the pole the line passes through ~90°N without breaking
  it('handles a path over the north pole (G10)', () => {
    const line = getBearingLine({ lat: 89.5, lon: 30 }, { lat: 89.6, lon: -150 }, { npoints: 21 });
    const lats = line.geometry.coordinates.map((c) => c[1]!);
    expect(Math.max(...lats)).toBeGreaterThan(89.95);
    for (const [lon, lat] of line.geometry.coordinates) {
      expect(Number.isFinite(lon)).toBe(true);
      expect(lat).toBeLessThanOrEqual(90);
    }
  });

  it('returns a two-point line for identical points', () => {
    const p = { lat: 10, lon: 20 };
    expect(getBearingLine(p, p).geometry.coordinates).toEqual([
      [20, 10],
      [20, 10],
    ]);
  });

  it('refuses exactly antipodal points with a clear error', () => {
    expect(() => getBearingLine({ lat: 0, lon: 0 }, { lat: 0, lon: 180 })).toThrow(/antipodal/);
  });
});

describe('listPointsAlong', () => {
  // case G8 as a sample path
  it('spaces points evenly from the first to the last point', () => {
    const from: LatLon = { lat: 53, lon: -8 };
    const to: LatLon = { lat: 53.3, lon: -7.45 };
    const points = listPointsAlong(from, to, 11);
    const total = getDistanceM(from, to);
    expect(points).toHaveLength(11);
    expect(points[0]).toMatchObject({ ...from, distanceM: 0 });
    expect(points[10]).toMatchObject({ ...to, distanceM: total });
    points.forEach((p, i) => {
      expect(p.distanceM).toBeCloseTo((total * i) / 10, 6);
      expect(getDistanceM(from, p)).toBeCloseTo(p.distanceM, 3);
    });
  });

  it.each([0, 1, 2.5])('rejects count %s', (count) => {
    expect(() => listPointsAlong({ lat: 0, lon: 0 }, { lat: 0, lon: 1 }, count)).toThrow(RangeError);
  });
});

describe('interpolatePointsAlong', () => {
  // Spherical linear interpolation (Shoemake 1985) against one destination call per point: the same
  // great circle, so equal within floating-point noise. Tolerance: 1e-9° (about 0.1 mm).
  it.each([
    [{ lat: -47.2, lon: -128.5 }, { lat: -47.15, lon: -128.3 }, 401],
    [{ lat: 51.5, lon: -0.1 }, { lat: 48.85, lon: 2.35 }, 64],
    [{ lat: 0, lon: 179.9 }, { lat: 0.1, lon: -179.9 }, 17],
    [{ lat: 60, lon: 10 }, { lat: 60, lon: 10.000001 }, 5],
  ])('matches listPointsAlong from %o to %o (%i points)', (from, to, count) => {
    const fast = interpolatePointsAlong(from, to, count);
    const slow = listPointsAlong(from, to, count);
    expect(fast).toHaveLength(count);
    fast.forEach((p, i) => {
      expect(Math.abs(p.lat - slow[i]!.lat)).toBeLessThan(1e-9);
      expect(Math.abs(wrap180(p.lon - slow[i]!.lon))).toBeLessThan(1e-9);
      expect(p.distanceM).toBe(slow[i]!.distanceM);
    });
  });

  it('keeps both ends exactly', () => {
    const from = { lat: 10, lon: 20 };
    const to = { lat: 10.5, lon: 20.5 };
    const pts = interpolatePointsAlong(from, to, 3);
    expect(pts[0]).toMatchObject(from);
    expect(pts[2]).toMatchObject(to);
    expect(() => interpolatePointsAlong(from, to, 1)).toThrow(RangeError);
  });
});
