// The measured signal map: readings binned into hexagons of a Web Mercator (EPSG:3857) hexagon grid,
// one grid per level, the level following the map zoom. The grid is PostGIS's ST_Hexagon layout
// (flat-topped hexagons, edge `size`, origin 0,0: hexagon i, j has its centre at x = 1.5·size·i,
// y = √3·size·(j + ½ when i is odd)), so the database can draw any hexagon from its i, j alone.
import { defineChoices, type Choice } from './choices';
import { getGradeBands, type GradeBand, type GradedQuantity, type SignalGrade } from './measurements';

export const SIGNAL_METRIC = defineChoices({ rsrp: 'RSRP', rsrq: 'RSRQ', sinr: 'SINR' } satisfies Partial<Record<GradedQuantity, string>>);
export const { values: SIGNAL_METRICS, labels: SIGNAL_METRIC_LABELS } = SIGNAL_METRIC;
export type SignalMetric = Choice<typeof SIGNAL_METRIC>;

export const SIGNAL_METRIC_UNITS: Record<SignalMetric, 'dBm' | 'dB'> = { rsrp: 'dBm', rsrq: 'dB', sinr: 'dB' };

/** Hexagons holding fewer readings than this (of the metric shown) are drawn faint: their median says little. */
export const SIGNAL_MIN_READINGS = 5;

export interface HexLevel {
  level: number;
  /** Edge length (= centre-to-corner distance) in Web Mercator metres. */
  sizeM: number;
  /** First tile zoom that uses this level. */
  fromZoom: number;
}

/**
 * Each level's hexagons are a quarter the size of the one before, and each serves two zooms: a
 * hexagon is about 13 px wide (corner to corner) where its level starts and grows to 52 px before
 * the next level takes over (MapLibre draws a 512 px tile per zoom step). From zoom 14 on the
 * 125 m hexagons just grow.
 */
export const HEX_LEVELS: readonly HexLevel[] = [
  { level: 0, sizeM: 32_000, fromZoom: 0 },
  { level: 1, sizeM: 8_000, fromZoom: 6 },
  { level: 2, sizeM: 2_000, fromZoom: 8 },
  { level: 3, sizeM: 500, fromZoom: 10 },
  { level: 4, sizeM: 125, fromZoom: 12 },
];

/** The level whose hexagons are drawn in a tile of zoom `z`. */
export function getHexLevelForZoom(z: number): HexLevel {
  let chosen = HEX_LEVELS[0]!;
  for (const level of HEX_LEVELS) if (z >= level.fromZoom) chosen = level;
  return chosen;
}

export function getHexLevel(level: number): HexLevel {
  const found = HEX_LEVELS.find((l) => l.level === level);
  if (!found) throw new RangeError(`No hexagon level ${level} (0–${HEX_LEVELS.length - 1})`);
  return found;
}

/** Centre of hexagon i, j of a grid of edge `size` (ST_Hexagon's layout). */
export function getHexCentre(size: number, i: number, j: number): { x: number; y: number } {
  return { x: 1.5 * size * i, y: Math.sqrt(3) * size * (j + (Math.abs(i) % 2 === 1 ? 0.5 : 0)) };
}

/**
 * The hexagon holding the point x, y (Web Mercator metres): the point in axial hexagon coordinates,
 * rounded to the nearest whole cube coordinate (x + y + z = 0), then turned into ST_Hexagon's column
 * and row ("Hexagonal Grids", Red Blob Games, A. Patel 2013 — common practice).
 */
export function getHexCell(size: number, x: number, y: number): { i: number; j: number } {
  const qf = ((2 / 3) * x) / size;
  const rf = ((-1 / 3) * x + (Math.sqrt(3) / 3) * y) / size;
  const sf = -qf - rf;
  let q = Math.round(qf);
  let r = Math.round(rf);
  const s = Math.round(sf);
  const dq = Math.abs(q - qf);
  const dr = Math.abs(r - rf);
  const ds = Math.abs(s - sf);
  if (dq > dr && dq > ds) q = -r - s;
  else if (dr > ds) r = -q - s;
  // + 0 turns a rounded −0 into 0.
  return { i: q + 0, j: r + (q - (q & 1)) / 2 + 0 };
}

/**
 * Columns and rows of every hexagon that can touch the box (Web Mercator metres): a hexagon spans
 * ±size in x and ±√3/2·size in y around its centre. A few extra at the edges are harmless; the
 * tile clips them.
 */
export function getHexRangeForBox(size: number, box: { xmin: number; ymin: number; xmax: number; ymax: number }) {
  const rowHeight = Math.sqrt(3) * size;
  return {
    iMin: Math.ceil((box.xmin - size) / (1.5 * size)),
    iMax: Math.floor((box.xmax + size) / (1.5 * size)),
    jMin: Math.floor(box.ymin / rowHeight - 1),
    jMax: Math.ceil(box.ymax / rowHeight),
  };
}

const EARTH_RADIUS_M = 6_378_137;

/** Easting and northing of a position in Web Mercator metres (EPSG:3857: a sphere of radius 6 378 137 m). */
export function toWebMercator(lon: number, lat: number): { x: number; y: number } {
  const phi = (lat * Math.PI) / 180;
  return { x: (EARTH_RADIUS_M * lon * Math.PI) / 180, y: EARTH_RADIUS_M * Math.log(Math.tan(Math.PI / 4 + phi / 2)) };
}

/** The inverse of toWebMercator. */
export function fromWebMercator(x: number, y: number): { lon: number; lat: number } {
  return { lon: ((x / EARTH_RADIUS_M) * 180) / Math.PI, lat: ((2 * Math.atan(Math.exp(y / EARTH_RADIUS_M)) - Math.PI / 2) * 180) / Math.PI };
}

/** Half the side of the Web Mercator square (π·R). */
const HALF_WORLD_M = Math.PI * EARTH_RADIUS_M;

/** The Web Mercator box of XYZ tile z/x/y (y counted from the north; OGC WebMercatorQuad, common practice). */
export function getTileBox(z: number, x: number, y: number): { xmin: number; ymin: number; xmax: number; ymax: number } {
  const side = (2 * HALF_WORLD_M) / 2 ** z;
  return { xmin: -HALF_WORLD_M + x * side, xmax: -HALF_WORLD_M + (x + 1) * side, ymax: HALF_WORLD_M - y * side, ymin: HALF_WORLD_M - (y + 1) * side };
}

/** Width of a level's hexagon on the ground (flat side to flat side, √3·size) at a latitude: Web Mercator stretches by 1/cos φ. */
export function getHexWidthOnGroundM(level: HexLevel, lat: number): number {
  return Math.sqrt(3) * level.sizeM * Math.cos((lat * Math.PI) / 180);
}

export interface SignalClass extends GradeBand {
  /** "−90 … −80 dBm", "≥ −80 dBm", "< −110 dBm". */
  range: string;
}

const minus = (v: number) => (v < 0 ? `−${Math.abs(v)}` : String(v));

/** The legend's classes of a metric, best first: the installers' quality grades and their value ranges. */
export function getSignalClasses(metric: SignalMetric): SignalClass[] {
  const unit = SIGNAL_METRIC_UNITS[metric];
  return getGradeBands(metric).map((b) => ({
    ...b,
    range: b.max === null ? `≥ ${minus(b.min!)} ${unit}` : b.min === null ? `< ${minus(b.max)} ${unit}` : `${minus(b.min)} … ${minus(b.max)} ${unit}`,
  }));
}

/** The class a median falls in (boundaries belong to the better grade, like gradeSignal). */
export function getSignalClass(metric: SignalMetric, value: number): SignalGrade {
  return getSignalClasses(metric).find((c) => c.min === null || value >= c.min)!.grade;
}
