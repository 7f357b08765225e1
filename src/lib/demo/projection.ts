// A local flat frame around the demo island: x east and y north in kilometres from the
// island's origin. Equirectangular is plenty for an invented 40 km island; geodesy proper
// lives in lib/domain/geodesy.ts.

export interface LocalPoint {
  x: number;
  y: number;
}

export interface GeoPoint {
  lat: number;
  lon: number;
}

/**
 * The island's origin, in open sea in the South Pacific, roughly 450 km north-west of the
 * ocean's point farthest from land; there is no real land within hundreds of kilometres.
 */
export const DEMO_ORIGIN: GeoPoint = { lat: -47.2, lon: -128.5 };

// Length of one degree near 47° S (WGS84 meridian degree ≈ 111.18 km; parallel degree = 111.32·cos φ).
const KM_PER_DEG_LAT = 111.18;
const KM_PER_DEG_LON = 111.32 * Math.cos((DEMO_ORIGIN.lat * Math.PI) / 180);

export function toGeo(p: LocalPoint): GeoPoint {
  return { lat: DEMO_ORIGIN.lat + p.y / KM_PER_DEG_LAT, lon: DEMO_ORIGIN.lon + p.x / KM_PER_DEG_LON };
}

export function toLocal(p: GeoPoint): LocalPoint {
  return { x: (p.lon - DEMO_ORIGIN.lon) * KM_PER_DEG_LON, y: (p.lat - DEMO_ORIGIN.lat) * KM_PER_DEG_LAT };
}

/** A GeoJSON position [lon, lat], rounded to 6 decimals (~0.1 m). */
export function toPosition(p: LocalPoint): [number, number] {
  const g = toGeo(p);
  return [round6(g.lon), round6(g.lat)];
}

export function round6(v: number): number {
  return Math.round(v * 1e6) / 1e6;
}

export function distanceKm(a: LocalPoint, b: LocalPoint): number {
  return Math.hypot(a.x - b.x, a.y - b.y);
}

/** Compass bearing in degrees (0 = north, clockwise) from a to b in the local frame. */
export function bearingDeg(a: LocalPoint, b: LocalPoint): number {
  const deg = (Math.atan2(b.x - a.x, b.y - a.y) * 180) / Math.PI;
  return deg < 0 ? deg + 360 : deg;
}

/** Distance from p to the segment a–b, and the fraction along it of the nearest point. */
export function distanceToSegmentKm(p: LocalPoint, a: LocalPoint, b: LocalPoint): { distanceKm: number; t: number } {
  const dx = b.x - a.x;
  const dy = b.y - a.y;
  const len2 = dx * dx + dy * dy;
  const t = len2 === 0 ? 0 : Math.max(0, Math.min(1, ((p.x - a.x) * dx + (p.y - a.y) * dy) / len2));
  return { distanceKm: Math.hypot(p.x - (a.x + t * dx), p.y - (a.y + t * dy)), t };
}

/** Even-odd point-in-polygon test for a closed or open ring. */
export function isInRing(p: LocalPoint, ring: readonly LocalPoint[]): boolean {
  let inside = false;
  for (let i = 0, j = ring.length - 1; i < ring.length; j = i++) {
    const a = ring[i]!;
    const b = ring[j]!;
    if (a.y > p.y !== b.y > p.y && p.x < ((b.x - a.x) * (p.y - a.y)) / (b.y - a.y) + a.x) inside = !inside;
  }
  return inside;
}

export function polylineLengthKm(line: readonly LocalPoint[]): number {
  let total = 0;
  for (let i = 1; i < line.length; i++) total += distanceKm(line[i - 1]!, line[i]!);
  return total;
}

/** Points every `stepKm` along a polyline (first and last included), with their chainage. */
export function samplePolyline(line: readonly LocalPoint[], stepKm: number): Array<LocalPoint & { chainageKm: number }> {
  const out: Array<LocalPoint & { chainageKm: number }> = [];
  if (line.length === 0) return out;
  out.push({ ...line[0]!, chainageKm: 0 });
  let carried = 0;
  let chainage = 0;
  for (let i = 1; i < line.length; i++) {
    const a = line[i - 1]!;
    const b = line[i]!;
    const seg = distanceKm(a, b);
    let at = stepKm - carried;
    while (at <= seg) {
      const t = at / seg;
      out.push({ x: a.x + t * (b.x - a.x), y: a.y + t * (b.y - a.y), chainageKm: chainage + at });
      at += stepKm;
    }
    carried = seg - (at - stepKm);
    chainage += seg;
  }
  const last = line[line.length - 1]!;
  if (distanceKm(out[out.length - 1]!, last) > stepKm * 0.25) out.push({ ...last, chainageKm: chainage });
  return out;
}
