// Counting readings in a region from the signal map's hexagons: a hexagon wholly inside the outline
// contributes its stored count, the others are counted reading by reading. The level is chosen per
// region so that about a hundred hexagons span it: the ring along the outline (counted directly)
// stays a few per cent of the area, and the hexagons summed stay in the thousands.
import { HEX_LEVELS, getHexRangeForBox, toWebMercator, type HexLevel } from './signal-map';

/** West, south, east, north in degrees. */
export type LonLatBox = readonly [number, number, number, number];

/** About this many hexagons across a region's longer side (or more, when no level is that coarse). */
export const HEXAGONS_ACROSS = 100;

/** Latitude limit of Web Mercator (EPSG:3857's square world). */
const MAX_LAT = 85.05112878;
const clampLat = (lat: number) => Math.max(-MAX_LAT, Math.min(MAX_LAT, lat));

function mercatorBox(box: LonLatBox) {
  const sw = toWebMercator(box[0], clampLat(box[1]));
  const ne = toWebMercator(box[2], clampLat(box[3]));
  return { xmin: sw.x, ymin: sw.y, xmax: ne.x, ymax: ne.y };
}

/** The coarsest level with at least HEXAGONS_ACROSS hexagon edges across the box; the finest for small boxes. */
export function getCountingLevel(box: LonLatBox): HexLevel {
  const m = mercatorBox(box);
  const extent = Math.max(m.xmax - m.xmin, m.ymax - m.ymin);
  return HEX_LEVELS.find((l) => l.sizeM * HEXAGONS_ACROSS <= extent) ?? HEX_LEVELS[HEX_LEVELS.length - 1]!;
}

export interface HexRange {
  iMin: number;
  iMax: number;
  jMin: number;
  jMax: number;
}

/** Columns and rows of every hexagon of the level that can hold a point of the box. */
export function getHexRangeForLonLatBox(level: HexLevel, box: LonLatBox): HexRange {
  return getHexRangeForBox(level.sizeM, mercatorBox(box));
}

/**
 * Every hexagon of the level that can hold a point of any of the boxes (areas whose stored counts are
 * out of date), or null when there are more than `limit`: then counting reading by reading is simpler.
 */
export function listHexesInBoxes(level: HexLevel, boxes: readonly LonLatBox[], limit: number): Array<{ i: number; j: number }> | null {
  const seen = new Set<string>();
  const found: Array<{ i: number; j: number }> = [];
  for (const box of boxes) {
    const r = getHexRangeForLonLatBox(level, box);
    if ((r.iMax - r.iMin + 1) * (r.jMax - r.jMin + 1) > limit) return null;
    for (let i = r.iMin; i <= r.iMax; i++) {
      for (let j = r.jMin; j <= r.jMax; j++) {
        const key = `${i},${j}`;
        if (seen.has(key)) continue;
        seen.add(key);
        found.push({ i, j });
        if (found.length > limit) return null;
      }
    }
  }
  return found;
}
