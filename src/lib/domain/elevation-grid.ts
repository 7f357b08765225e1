// Elevation grids (DEM tiles) on a regular latitude/longitude lattice: bilinear sampling,
// terrain profiles along a path with a report of where data is missing, and SRTM .hgt decoding.
import { EARTH_MEAN_RADIUS_M, getDistanceM, interpolatePointsAlong, type LatLon } from './geodesy';

/**
 * How the samples sit relative to the bounds.
 *
 * - `point`: each sample is the height at a lattice node; the first and last columns lie on `west`
 *   and `east`, the first and last rows on `north` and `south` (SRTM .hgt, GeoTIFF PixelIsPoint).
 *   Spacing is (east − west) / (width − 1).
 * - `area`: each sample stands for a cell; the bounds are the outer edges of the outer cells and the
 *   value belongs to the cell's centre (GeoTIFF PixelIsArea, the TIFF default). Spacing is
 *   (east − west) / width. Between the outermost centres and the edges (half a cell) the nearest
 *   cell's value is used, since that ground belongs to the cell.
 */
export type GridRegistration = 'point' | 'area';

export type ElevationSamples = Float32Array | Int16Array;

/** A single-band elevation raster in WGS84 degrees, heights in metres. */
export interface ElevationGrid {
  /** Optional identity (e.g. the stored grid's id), reported by profiles. */
  id?: string;
  west: number;
  south: number;
  east: number;
  north: number;
  /** Columns and rows (at least 2 each). */
  width: number;
  height: number;
  registration: GridRegistration;
  /** The value that marks a void; NaN is always treated as a void too. */
  nodata: number | null;
  /** Row-major, row 0 is the northernmost row, column 0 the westernmost. */
  values: ElevationSamples;
}

/** Where a grid lies and how its samples are laid out, without the samples. */
export type GridFrame = Pick<ElevationGrid, 'west' | 'south' | 'east' | 'north' | 'width' | 'height' | 'registration'>;

/** A file or grid that cannot be used as elevation data; the message says why. */
export class ElevationDataError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'ElevationDataError';
  }
}

/** Metres along a meridian per degree on the mean-radius sphere (the sphere geodesy.ts works on). */
export const METRES_PER_DEGREE = (Math.PI * EARTH_MEAN_RADIUS_M) / 180;

/** Step used for a profile when no grid touches the path (3 arc-seconds ≈ 90 m, a common DEM spacing). */
export const DEFAULT_PROFILE_STEP_M = 90;
/** Upper bound on profile samples unless the caller sets one; ~450 km at 90 m. */
export const DEFAULT_MAX_PROFILE_SAMPLES = 5000;

// Coordinates computed from bounds and spacing carry rounding error; a point this close
// (degrees, ~1 mm) to the edge still counts as inside.
const EDGE_TOLERANCE_DEG = 1e-8;

export function getGridSpacingDeg(grid: GridFrame): { lonDeg: number; latDeg: number } {
  const cols = grid.registration === 'point' ? grid.width - 1 : grid.width;
  const rows = grid.registration === 'point' ? grid.height - 1 : grid.height;
  return { lonDeg: (grid.east - grid.west) / cols, latDeg: (grid.north - grid.south) / rows };
}

/**
 * The grid's spacing in metres: the smaller of the north–south and east–west spacing, the latter
 * taken at the grid's latitude nearest the equator (where it is widest).
 */
export function getGridSpacingM(grid: GridFrame): number {
  const { eastWestM, northSouthM } = getGridSpacingMetres(grid);
  return Math.min(northSouthM, eastWestM);
}

/** Both spacings on the ground: north–south, and east–west at the latitude nearest the equator. */
export function getGridSpacingMetres(grid: GridFrame): { eastWestM: number; northSouthM: number } {
  const { lonDeg, latDeg } = getGridSpacingDeg(grid);
  const widestLat = grid.south <= 0 && grid.north >= 0 ? 0 : Math.min(Math.abs(grid.south), Math.abs(grid.north));
  return { eastWestM: lonDeg * METRES_PER_DEGREE * Math.cos((widestLat * Math.PI) / 180), northSouthM: latDeg * METRES_PER_DEGREE };
}

/** Position of the sample at (row, col): the lattice node, or the cell centre for `area` grids. */
export function getSamplePosition(grid: GridFrame, row: number, col: number): LatLon {
  const { lonDeg, latDeg } = getGridSpacingDeg(grid);
  const half = grid.registration === 'area' ? 0.5 : 0;
  return { lat: grid.north - (row + half) * latDeg, lon: grid.west + (col + half) * lonDeg };
}

export function isGridCovering(grid: GridFrame, lat: number, lon: number): boolean {
  return (
    lat >= grid.south - EDGE_TOLERANCE_DEG &&
    lat <= grid.north + EDGE_TOLERANCE_DEG &&
    lon >= grid.west - EDGE_TOLERANCE_DEG &&
    lon <= grid.east + EDGE_TOLERANCE_DEG
  );
}

export function isNodata(grid: Pick<ElevationGrid, 'nodata'>, value: number): boolean {
  return Number.isNaN(value) || (grid.nodata !== null && value === grid.nodata);
}

/** Throws ElevationDataError unless the grid is usable. */
export function assertValidGrid(grid: ElevationGrid): void {
  const { west, south, east, north, width, height } = grid;
  if (!Number.isInteger(width) || !Number.isInteger(height) || width < 2 || height < 2) {
    throw new ElevationDataError(`The grid must be at least 2 × 2 samples (it is ${width} × ${height})`);
  }
  if (grid.values.length !== width * height) {
    throw new ElevationDataError(`The grid has ${grid.values.length} samples; ${width} × ${height} = ${width * height} expected`);
  }
  if (![west, south, east, north].every(Number.isFinite) || !(west < east) || !(south < north)) {
    throw new ElevationDataError('The grid bounds are not a valid west < east, south < north box');
  }
  if (south < -90 - EDGE_TOLERANCE_DEG || north > 90 + EDGE_TOLERANCE_DEG) {
    throw new ElevationDataError('The grid reaches beyond ±90° latitude: are the coordinates in degrees (EPSG:4326)?');
  }
  // A grid is one west < east box; data that spans the antimeridian is imported as two grids.
  if (west < -180 - EDGE_TOLERANCE_DEG || east > 180 + EDGE_TOLERANCE_DEG) {
    throw new ElevationDataError('The grid reaches beyond ±180° longitude: split it at the antimeridian');
  }
}

/**
 * Ground height in metres at a position, interpolated bilinearly between the four surrounding
 * samples. Null outside the grid, and null when any sample that contributes to the value is a void
 * (voids are reported, never guessed).
 */
export function sampleElevation(grid: ElevationGrid, lat: number, lon: number): number | null {
  if (!isGridCovering(grid, lat, lon)) return null;
  const { lonDeg, latDeg } = getGridSpacingDeg(grid);
  const half = grid.registration === 'area' ? 0.5 : 0;
  const maxCol = grid.width - 1;
  const maxRow = grid.height - 1;
  const fc = Math.min(maxCol, Math.max(0, (lon - grid.west) / lonDeg - half));
  const fr = Math.min(maxRow, Math.max(0, (grid.north - lat) / latDeg - half));
  const c0 = Math.min(Math.floor(fc), maxCol - 1);
  const r0 = Math.min(Math.floor(fr), maxRow - 1);
  const tc = fc - c0;
  const tr = fr - r0;
  const { values, width } = grid;
  const top = r0 * width + c0;
  // The four neighbours in a fixed order (north-west, north-east, south-west, south-east); a zero
  // weight skips its sample, so a void there does not matter.
  let sum = 0;
  for (let k = 0; k < 4; k++) {
    const south = k >> 1;
    const east = k & 1;
    const w = (south ? tr : 1 - tr) * (east ? tc : 1 - tc);
    if (w === 0) continue;
    const v = values[top + south * width + east]!;
    if (isNodata(grid, v)) return null;
    sum += w * v;
  }
  return sum;
}

export interface GridStats {
  minM: number | null;
  maxM: number | null;
  nodataCount: number;
}

export function getGridStats(grid: ElevationGrid): GridStats {
  let min = Infinity;
  let max = -Infinity;
  let nodataCount = 0;
  for (let i = 0; i < grid.values.length; i++) {
    const v = grid.values[i]!;
    if (isNodata(grid, v)) {
      nodataCount += 1;
      continue;
    }
    if (v < min) min = v;
    if (v > max) max = v;
  }
  return nodataCount === grid.values.length ? { minM: null, maxM: null, nodataCount } : { minM: min, maxM: max, nodataCount };
}

// ── Profiles ─────────────────────────────────────────────────────────────────────────────

export interface ElevationProfilePoint extends LatLon {
  /** Distance from `from` along the great circle, metres. */
  distanceM: number;
  /** Ground height, metres; null where no grid has data. */
  groundM: number | null;
}

export interface ProfileCoverage {
  sampleCount: number;
  coveredCount: number;
  /** Share of samples with a ground height, 0…1. */
  fraction: number;
  complete: boolean;
  /** Distance of the first sample without data, or null when every sample has data. */
  firstMissingDistanceM: number | null;
  /** Runs of samples without data, from the first to the last missing sample of each run. */
  missingRanges: Array<{ fromM: number; toM: number }>;
}

export interface ElevationProfile {
  points: ElevationProfilePoint[];
  distanceM: number;
  /** Distance between consecutive samples, metres. */
  stepM: number;
  /** Spacing of the finest grid touching the path, or null when none does. */
  gridSpacingM: number | null;
  /** Ids of the grids that supplied at least one height, finest first. */
  gridIds: string[];
  coverage: ProfileCoverage;
}

export interface ProfileOptions {
  /** Most samples to take (the step grows to fit). Default DEFAULT_MAX_PROFILE_SAMPLES. */
  maxSamples?: number;
  /** Step when no grid touches the path. Default DEFAULT_PROFILE_STEP_M. */
  defaultStepM?: number;
}

interface Box {
  west: number;
  south: number;
  east: number;
  north: number;
}

/**
 * The path's latitude/longitude boxes, from points along the great circle (it may bow past the
 * ends): one box, or two when the path crosses the antimeridian (one each side of ±180°).
 */
export function getPathBoxes(from: LatLon, to: LatLon): Box[] {
  const pts = interpolatePointsAlong(from, to, 33);
  const south = Math.min(...pts.map((p) => p.lat));
  const north = Math.max(...pts.map((p) => p.lat));
  const crosses = pts.some((p, i) => i > 0 && Math.abs(p.lon - pts[i - 1]!.lon) > 180);
  if (!crosses) {
    const lons = pts.map((p) => p.lon);
    return [{ west: Math.min(...lons), south, east: Math.max(...lons), north }];
  }
  const eastern = pts.filter((p) => p.lon >= 0).map((p) => p.lon);
  const western = pts.filter((p) => p.lon < 0).map((p) => p.lon);
  return [
    { west: Math.min(...eastern), south, east: 180, north },
    { west: -180, south, east: Math.max(...western), north },
  ];
}

function isBoxOverlapping(a: Box, b: Box): boolean {
  return a.west <= b.east && b.west <= a.east && a.south <= b.north && b.south <= a.north;
}

/**
 * Ground heights along the great circle from `from` to `to`, sampled at the spacing of the finest
 * grid the path touches (so no detail of the data is skipped), both ends included. Each sample takes
 * its height from the finest grid that has data there, falling back to coarser ones. The coverage
 * tells callers how much of the path has data and where it is missing. A path across the
 * antimeridian takes heights from the grids on both sides.
 */
export function sampleElevationProfile(grids: readonly ElevationGrid[], from: LatLon, to: LatLon, options: ProfileOptions = {}): ElevationProfile {
  const maxSamples = Math.max(2, Math.floor(options.maxSamples ?? DEFAULT_MAX_PROFILE_SAMPLES));
  const distanceM = getDistanceM(from, to);
  const boxes = getPathBoxes(from, to);
  const touching = grids
    .filter((g) => boxes.some((box) => isBoxOverlapping(g, box)))
    .map((grid) => ({ grid, spacingM: getGridSpacingM(grid) }))
    .sort((a, b) => a.spacingM - b.spacingM);
  const gridSpacingM = touching[0]?.spacingM ?? null;
  const wantedStepM = gridSpacingM ?? options.defaultStepM ?? DEFAULT_PROFILE_STEP_M;
  const count = Math.min(maxSamples, Math.max(2, Math.ceil(distanceM / wantedStepM) + 1));

  const used = new Set<ElevationGrid>();
  const points = interpolatePointsAlong(from, to, count).map(({ lat, lon, distanceM: d }) => {
    let groundM: number | null = null;
    for (const { grid } of touching) {
      groundM = sampleElevation(grid, lat, lon);
      if (groundM !== null) {
        used.add(grid);
        break;
      }
    }
    return { distanceM: d, lat, lon, groundM };
  });

  return {
    points,
    distanceM,
    stepM: distanceM / (count - 1),
    gridSpacingM,
    gridIds: touching.filter(({ grid }) => used.has(grid) && grid.id !== undefined).map(({ grid }) => grid.id!),
    coverage: getProfileCoverage(points),
  };
}

export function getProfileCoverage(points: ReadonlyArray<Pick<ElevationProfilePoint, 'distanceM' | 'groundM'>>): ProfileCoverage {
  const missingRanges: Array<{ fromM: number; toM: number }> = [];
  let covered = 0;
  let run: { fromM: number; toM: number } | null = null;
  for (const p of points) {
    if (p.groundM !== null) {
      covered += 1;
      run = null;
    } else if (run) {
      run.toM = p.distanceM;
    } else {
      run = { fromM: p.distanceM, toM: p.distanceM };
      missingRanges.push(run);
    }
  }
  return {
    sampleCount: points.length,
    coveredCount: covered,
    fraction: points.length ? covered / points.length : 0,
    complete: points.length > 0 && covered === points.length,
    firstMissingDistanceM: missingRanges[0]?.fromM ?? null,
    missingRanges,
  };
}

// ── SRTM .hgt ─────────────────────────────────────────────────────────────────────────────
// A .hgt tile covers one degree square whose south-west corner is in its name (N45E006,
// S48W129). It holds big-endian signed 16-bit heights in metres, rows north to south, with
// 1201 × 1201 samples (3 arc-seconds) or 3601 × 3601 (1 arc-second); the outermost rows and
// columns lie on the tile's edges and repeat in the neighbouring tiles; −32768 marks a void.
// (USGS/NASA SRTM documentation and common practice.)

export const HGT_NODATA = -32768;
const HGT_SIZES = [1201, 3601] as const;

/** South-west corner of a .hgt tile from its file name, e.g. "S48W129.hgt" → −48, −129. */
export function parseHgtName(fileName: string): { south: number; west: number } {
  const base = fileName.split(/[\\/]/).pop() ?? '';
  const m = /^([NS])(\d{2})([EW])(\d{3})(?:\.[A-Za-z0-9_-]+)*\.hgt$/i.exec(base);
  if (!m) {
    throw new ElevationDataError(`"${base}" is not a .hgt tile name: expected the south-west corner, like N45E006.hgt or S48W129.hgt`);
  }
  const south = Number(m[2]) * (m[1]!.toUpperCase() === 'S' ? -1 : 1);
  const west = Number(m[4]) * (m[3]!.toUpperCase() === 'W' ? -1 : 1);
  if (south < -90 || south > 89 || west < -180 || west > 179) {
    throw new ElevationDataError(`"${base}" names a corner outside the globe`);
  }
  return { south, west };
}

export function parseHgt(fileName: string, bytes: Uint8Array): ElevationGrid {
  const { south, west } = parseHgtName(fileName);
  const size = HGT_SIZES.find((n) => n * n * 2 === bytes.length);
  if (!size) {
    throw new ElevationDataError(
      `A .hgt tile holds 1201 × 1201 or 3601 × 3601 two-byte samples (${1201 * 1201 * 2} or ${3601 * 3601 * 2} bytes); this file has ${bytes.length} bytes`,
    );
  }
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const values = new Int16Array(size * size);
  for (let i = 0; i < values.length; i++) values[i] = view.getInt16(i * 2, false);
  return { west, south, east: west + 1, north: south + 1, width: size, height: size, registration: 'point', nodata: HGT_NODATA, values };
}
