// Ground elevation of the demo island: hills and ridges on a gently rising plateau, fractal
// roughness, valleys carved along the rivers and flat lake surfaces; the sea floor shelves
// away offshore. Exported so that an elevation grid (e.g. GeoTIFF/.hgt tiles) can be written
// from the same function the demo masts and readings were generated with.
import { createIslandModel, getNormalisedRadius, type IslandModel } from './geography';
import { distanceKm, distanceToSegmentKm, isInRing, toGeo, toLocal, type LocalPoint } from './projection';
import { createValueNoise } from './noise';
import { hashString } from './random';

export type ElevationFn = (p: LocalPoint) => number;

function smoothstep(edge0: number, edge1: number, x: number): number {
  const t = Math.max(0, Math.min(1, (x - edge0) / (edge1 - edge0)));
  return t * t * (3 - 2 * t);
}

interface CarvedRiver {
  line: LocalPoint[];
  chainage: number[];
  lengthKm: number;
  sourceM: number;
  /** Segment indices (1-based end points) near each 1 km cell, keyed "cx,cy". */
  nearby: Map<string, number[]>;
}

const VALLEY_REACH_KM = 1.6;
const INDEX_CELL_KM = 1;

const cellKey = (x: number, y: number) => `${Math.floor(x / INDEX_CELL_KM)},${Math.floor(y / INDEX_CELL_KM)}`;

/** Which segments of a line come within the valley reach of each index cell. */
function indexSegments(line: LocalPoint[]): Map<string, number[]> {
  const index = new Map<string, number[]>();
  for (let i = 1; i < line.length; i++) {
    const a = line[i - 1]!;
    const b = line[i]!;
    const x0 = Math.floor((Math.min(a.x, b.x) - VALLEY_REACH_KM) / INDEX_CELL_KM);
    const x1 = Math.floor((Math.max(a.x, b.x) + VALLEY_REACH_KM) / INDEX_CELL_KM);
    const y0 = Math.floor((Math.min(a.y, b.y) - VALLEY_REACH_KM) / INDEX_CELL_KM);
    const y1 = Math.floor((Math.max(a.y, b.y) + VALLEY_REACH_KM) / INDEX_CELL_KM);
    for (let cx = x0; cx <= x1; cx++) {
      for (let cy = y0; cy <= y1; cy++) {
        const key = `${cx},${cy}`;
        const list = index.get(key);
        if (list) list.push(i);
        else index.set(key, [i]);
      }
    }
  }
  return index;
}

interface LakeArea {
  ring: LocalPoint[];
  level: number;
  minX: number;
  maxX: number;
  minY: number;
  maxY: number;
}

/** Elevation in metres at a point of the island's local frame. */
export function createElevationFn(model: IslandModel): ElevationFn {
  const noise = createValueNoise(hashString(`elevation:${model.seed}`));
  const octaves = [
    { scaleKm: 5, amp: 28 },
    { scaleKm: 2.2, amp: 14 },
    { scaleKm: 0.9, amp: 6 },
    { scaleKm: 0.4, amp: 2.5 },
  ];

  const terrain = (p: LocalPoint): number => {
    const rho = getNormalisedRadius(model.shape, p);
    if (rho >= 1) return Math.max(-180, -(rho - 1) * 450);
    const coast = smoothstep(0, 0.18, 1 - rho);
    let hills = 0;
    for (const peak of model.peaks) {
      const dx = p.x - peak.centre.x;
      const dy = p.y - peak.centre.y;
      if (Math.abs(dx) > peak.sigmaKm * peak.stretch * 4 || Math.abs(dy) > peak.sigmaKm * peak.stretch * 4) continue;
      const a = (peak.axisDeg * Math.PI) / 180;
      const along = (dx * Math.cos(a) + dy * Math.sin(a)) / peak.stretch;
      const across = -dx * Math.sin(a) + dy * Math.cos(a);
      hills += peak.heightM * Math.exp(-(along * along + across * across) / (2 * peak.sigmaKm * peak.sigmaKm));
    }
    let rough = 0;
    for (const o of octaves) rough += o.amp * noise(p.x / o.scaleKm + 17.3, p.y / o.scaleKm - 4.1);
    // Rougher ground on the hills than on the lowland.
    const e = coast * (12 + 55 * (1 - rho) + hills + rough * (0.6 + hills / 400));
    return Math.max(1, e);
  };

  const lakeLevels = model.lakes.map((lake) => Math.min(...lake.ring.map(terrain)) - 1);

  const lakes: LakeArea[] = model.lakes.map((lake, i) => ({
    ring: lake.ring,
    level: lakeLevels[i]!,
    minX: Math.min(...lake.ring.map((q) => q.x)),
    maxX: Math.max(...lake.ring.map((q) => q.x)),
    minY: Math.min(...lake.ring.map((q) => q.y)),
    maxY: Math.max(...lake.ring.map((q) => q.y)),
  }));

  const rivers: CarvedRiver[] = model.rivers.map((r) => {
    const chainage = [0];
    for (let i = 1; i < r.line.length; i++) chainage.push(chainage[i - 1]! + distanceKm(r.line[i - 1]!, r.line[i]!));
    const lakeIndex = model.lakes.findIndex((l) => l.name === r.fromLake);
    const sourceM = lakeIndex >= 0 ? lakeLevels[lakeIndex]! : terrain(r.line[0]!) * 0.85;
    return { line: r.line, chainage, lengthKm: chainage[chainage.length - 1]!, sourceM, nearby: indexSegments(r.line) };
  });

  return (p: LocalPoint): number => {
    for (const lake of lakes) {
      if (p.x >= lake.minX && p.x <= lake.maxX && p.y >= lake.minY && p.y <= lake.maxY && isInRing(p, lake.ring)) return lake.level;
    }
    let e = terrain(p);
    if (e <= 0) return e;
    const key = cellKey(p.x, p.y);
    for (const r of rivers) {
      const segments = r.nearby.get(key);
      if (!segments) continue;
      let best = Infinity;
      let at = 0;
      for (const i of segments) {
        const { distanceKm: d, t } = distanceToSegmentKm(p, r.line[i - 1]!, r.line[i]!);
        if (d < best) {
          best = d;
          at = r.chainage[i - 1]! + t * (r.chainage[i]! - r.chainage[i - 1]!);
        }
      }
      if (best > VALLEY_REACH_KM) continue;
      const f = at / r.lengthKm;
      const bed = r.sourceM * (1 - f) ** 1.3;
      const widthKm = 0.3 + 0.45 * f;
      const weight = Math.exp(-((best / widthKm) ** 2));
      if (e > bed) e = bed + (e - bed) * (1 - weight);
    }
    return Math.max(0.5, e);
  };
}

let defaultModel: IslandModel | null = null;
let defaultFn: ElevationFn | null = null;

/** The demo island built from the fixed demo seed (memoised). */
export function getDemoIsland(): IslandModel {
  defaultModel ??= createIslandModel();
  return defaultModel;
}

/**
 * Ground elevation in metres above sea level at a WGS84 position on or around the demo island
 * (negative offshore, the sea surface is 0). Deterministic; the same values as the demo data.
 */
export function getDemoElevationM(lat: number, lon: number): number {
  defaultFn ??= createElevationFn(getDemoIsland());
  return defaultFn(toLocal({ lat, lon }));
}

export interface GeoBounds {
  west: number;
  south: number;
  east: number;
  north: number;
}

/** The island's bounding box plus a margin of sea, in WGS84 degrees. */
export function getIslandBounds(model: IslandModel, marginKm = 0): GeoBounds {
  const xs = model.coastline.map((p) => p.x);
  const ys = model.coastline.map((p) => p.y);
  const sw = toGeo({ x: Math.min(...xs) - marginKm, y: Math.min(...ys) - marginKm });
  const ne = toGeo({ x: Math.max(...xs) + marginKm, y: Math.max(...ys) + marginKm });
  return { west: sw.lon, south: sw.lat, east: ne.lon, north: ne.lat };
}
