import { bearing, destination, distance, greatCircle } from '@turf/turf';
import type { Feature, GeoJsonProperties, LineString, Position } from 'geojson';

/** A WGS84 position in decimal degrees. */
export interface LatLon {
  lat: number;
  lon: number;
}

/**
 * Mean earth radius R1 = (2a + b)/3 of WGS84 (NGA.STND.0036), the radius turf uses.
 *
 * Every function here works on this sphere. Against the WGS84 ellipsoid that errs by about −0.45 % … +0.56 %
 * in distance and up to ~0.2° in bearing (worst near the equator; compared with geographiclib-geodesic): negligible
 * for aiming a 40° beam, not for survey work.
 */
export const EARTH_MEAN_RADIUS_M = 6_371_008.8;

function toPosition(point: LatLon): Position {
  return [point.lon, point.lat];
}

/** Any angle in degrees mapped to [0, 360). */
export function normaliseBearing(deg: number): number {
  const rest = deg % 360;
  const positive = rest < 0 ? rest + 360 : rest;
  // A tiny negative remainder plus 360 rounds to exactly 360 in double precision.
  return positive >= 360 ? 0 : positive + 0;
}

/** Any angle in degrees mapped to [−180, 180), e.g. an offset from a sector azimuth. */
export function wrap180(deg: number): number {
  const bearingDeg = normaliseBearing(deg);
  return bearingDeg >= 180 ? bearingDeg - 360 : bearingDeg;
}

/** Great-circle (haversine) distance in metres. */
export function getDistanceM(from: LatLon, to: LatLon): number {
  return distance(toPosition(from), toPosition(to), { units: 'meters' });
}

/** Initial great-circle bearing from `from` towards `to`, true north, in [0, 360). */
export function getInitialBearing(from: LatLon, to: LatLon): number {
  return normaliseBearing(bearing(toPosition(from), toPosition(to)));
}

/**
 * Bearing seen from `to` looking back at `from` (e.g. mast → customer when `from` is the customer).
 * Computed as the initial bearing from the other end: on a sphere or ellipsoid it is not the forward
 * bearing + 180° (meridians converge).
 */
export function getReverseBearing(from: LatLon, to: LatLon): number {
  return getInitialBearing(to, from);
}

/** The point `distanceM` away from `origin` along the initial bearing `bearingDeg` (great circle). */
export function getDestination(origin: LatLon, distanceM: number, bearingDeg: number): LatLon {
  const [lon, lat] = destination(toPosition(origin), distanceM, bearingDeg, { units: 'meters' }).geometry.coordinates as [number, number];
  return { lat, lon: wrap180(lon) };
}

/**
 * `count` evenly spaced points from `from` to `to` (both included) along the great circle, with their
 * distance from `from` — the sampling positions of a terrain profile.
 */
export function listPointsAlong(from: LatLon, to: LatLon, count: number): Array<LatLon & { distanceM: number }> {
  if (!Number.isInteger(count) || count < 2) throw new RangeError('count must be an integer ≥ 2');
  const totalM = getDistanceM(from, to);
  const bearingDeg = getInitialBearing(from, to);
  return Array.from({ length: count }, (_, i) => {
    const distanceM = (totalM * i) / (count - 1);
    if (i === 0) return { ...from, distanceM };
    if (i === count - 1) return { ...to, distanceM };
    return { ...getDestination(from, distanceM, bearingDeg), distanceM };
  });
}

/**
 * The same points as listPointsAlong, by spherical linear interpolation between the two ends' unit
 * vectors instead of one destination call per point: the position at fraction t of the central angle Ω
 * is (sin((1−t)Ω)·A + sin(tΩ)·B) / sin Ω (Shoemake 1985, "slerp"; common practice for great circles).
 * Equal to listPointsAlong within floating-point noise (well under a millimetre); profiles sample many
 * points along each path, and this costs a few multiplications per point.
 */
export function interpolatePointsAlong(from: LatLon, to: LatLon, count: number): Array<LatLon & { distanceM: number }> {
  if (!Number.isInteger(count) || count < 2) throw new RangeError('count must be an integer ≥ 2');
  const totalM = getDistanceM(from, to);
  const rad = Math.PI / 180;
  const [la1, lo1, la2, lo2] = [from.lat * rad, from.lon * rad, to.lat * rad, to.lon * rad];
  const a = [Math.cos(la1) * Math.cos(lo1), Math.cos(la1) * Math.sin(lo1), Math.sin(la1)];
  const b = [Math.cos(la2) * Math.cos(lo2), Math.cos(la2) * Math.sin(lo2), Math.sin(la2)];
  const omega = totalM / EARTH_MEAN_RADIUS_M;
  const sinOmega = Math.sin(omega);
  return Array.from({ length: count }, (_, i) => {
    const distanceM = (totalM * i) / (count - 1);
    if (i === 0) return { ...from, distanceM };
    if (i === count - 1) return { ...to, distanceM };
    const t = i / (count - 1);
    // Coincident or nearly coincident ends: plain linear interpolation is exact enough.
    const [wa, wb] = sinOmega < 1e-12 ? [1 - t, t] : [Math.sin((1 - t) * omega) / sinOmega, Math.sin(t * omega) / sinOmega];
    const x = wa * a[0]! + wb * b[0]!;
    const y = wa * a[1]! + wb * b[1]!;
    const z = wa * a[2]! + wb * b[2]!;
    return { lat: Math.atan2(z, Math.hypot(x, y)) / rad, lon: wrap180(Math.atan2(y, x) / rad), distanceM };
  });
}

/**
 * The great-circle line from `from` to `to` as a GeoJSON LineString for the map.
 *
 * Antimeridian: longitudes are unwrapped so consecutive vertices never jump by more than 180°; a line
 * from 179.7° to −179.8° ends at 180.2°. MapLibre draws such a line continuously across the date line.
 * (RFC 7946 §3.1.9 prefers cutting the line in two for interchange files; cut it before exporting.)
 * turf's own dateline split (option `offset`) is turned off because it yields a MultiLineString.
 */
export function getBearingLine(from: LatLon, to: LatLon, options: { npoints?: number; properties?: GeoJsonProperties } = {}): Feature<LineString> {
  const npoints = options.npoints ?? 64;
  let coordinates: Position[];
  if (from.lat === to.lat && from.lon === to.lon) {
    coordinates = [toPosition(from), toPosition(to)];
  } else {
    let line;
    try {
      line = greatCircle(toPosition(from), toPosition(to), { npoints, offset: 0 });
    } catch {
      throw new RangeError('No unique great circle joins two antipodal points');
    }
    if (line.geometry.type !== 'LineString') throw new Error('Expected a single great-circle LineString');
    coordinates = line.geometry.coordinates.map((position) => [position[0], position[1]]);
    // The generator rounds to 6 decimals; keep the exact ends.
    coordinates[0] = toPosition(from);
    coordinates[coordinates.length - 1] = toPosition(to);
  }
  return {
    type: 'Feature',
    properties: options.properties ?? {},
    geometry: { type: 'LineString', coordinates: unwrapLongitudes(coordinates) },
  };
}

function unwrapLongitudes(coordinates: Position[]): Position[] {
  const result: Position[] = [];
  for (const [lon, lat] of coordinates) {
    const previous = result[result.length - 1];
    if (!previous) {
      result.push([lon, lat]);
      continue;
    }
    result.push([previous[0] + wrap180(lon - previous[0]), lat]);
  }
  return result;
}
