import { describe, expect, it } from 'vitest';
import {
  DEFAULT_PROFILE_STEP_M,
  ElevationDataError,
  HGT_NODATA,
  METRES_PER_DEGREE,
  assertValidGrid,
  getGridSpacingDeg,
  getGridSpacingM,
  getGridSpacingMetres,
  getGridStats,
  getProfileCoverage,
  getPathBoxes,
  getSamplePosition,
  parseHgt,
  parseHgtName,
  sampleElevation,
  sampleElevationProfile,
  type ElevationGrid,
} from '../../src/lib/domain/elevation-grid';
import { getDistanceM } from '../../src/lib/domain/geodesy';

/** A hand-made 3 × 3 point grid over 10…12° E, 50…52° N (1° spacing). Rows north → south. */
const POINT_GRID: ElevationGrid = {
  west: 10,
  south: 50,
  east: 12,
  north: 52,
  width: 3,
  height: 3,
  registration: 'point',
  nodata: -9999,
  // row 52° N: 100 200 300 / row 51° N: 400 500 600 / row 50° N: 700 800 900
  values: new Float32Array([100, 200, 300, 400, 500, 600, 700, 800, 900]),
};

describe('sampleElevation on a point-registered grid (bilinear interpolation, textbook definition)', () => {
  it.each([
    ['the north-west node', 52, 10, 100],
    ['the south-east node', 50, 12, 900],
    ['the middle node', 51, 11, 500],
    ['half-way along the top row', 52, 10.5, 150],
    ['half-way down the west column', 51.5, 10, 250],
    ['the centre of the north-west cell', 51.5, 10.5, 300],
    // weights 0.5625·500 + 0.1875·600 + 0.1875·800 + 0.0625·900
    ['a quarter into the south-east cell', 50.75, 11.25, 600],
    ['the east edge, between nodes', 50.5, 12, 750],
  ])('gives the expected height at %s', (_label, lat, lon, expected) => {
    expect(sampleElevation(POINT_GRID, lat, lon)).toBeCloseTo(expected, 6);
  });

  it.each([
    ['north of the grid', 52.01, 11],
    ['south of the grid', 49.99, 11],
    ['west of the grid', 51, 9.99],
    ['east of the grid', 51, 12.01],
  ])('answers null %s', (_label, lat, lon) => {
    expect(sampleElevation(POINT_GRID, lat, lon)).toBeNull();
  });

  it('treats a position a hair outside the edge (float rounding) as on the edge', () => {
    expect(sampleElevation(POINT_GRID, 52 + 1e-10, 10 - 1e-10)).toBeCloseTo(100, 6);
  });
});

describe('sampleElevation with voids', () => {
  const withVoid: ElevationGrid = { ...POINT_GRID, values: new Float32Array([100, 200, 300, 400, -9999, 600, 700, 800, 900]) };

  it('answers null at the void and wherever the void contributes', () => {
    expect(sampleElevation(withVoid, 51, 11)).toBeNull();
    expect(sampleElevation(withVoid, 51.5, 10.5)).toBeNull();
    expect(sampleElevation(withVoid, 50.1, 11.9)).toBeNull();
  });

  it('still answers where the void has no weight (on a node or an edge away from it)', () => {
    expect(sampleElevation(withVoid, 52, 10.5)).toBeCloseTo(150, 6);
    expect(sampleElevation(withVoid, 50, 11)).toBeCloseTo(800, 6);
  });

  it('treats NaN as a void even without a nodata value', () => {
    const nan: ElevationGrid = { ...POINT_GRID, nodata: null, values: new Float32Array([1, 2, 3, 4, NaN, 6, 7, 8, 9]) };
    expect(sampleElevation(nan, 51, 11)).toBeNull();
    expect(sampleElevation(nan, 52, 10)).toBe(1);
  });
});

describe('sampleElevation on an area-registered grid (GeoTIFF PixelIsArea: values at cell centres)', () => {
  // 2 × 2 cells over 0…2° E, 0…2° N: centres at 0.5 and 1.5.
  const area: ElevationGrid = {
    west: 0,
    south: 0,
    east: 2,
    north: 2,
    width: 2,
    height: 2,
    registration: 'area',
    nodata: null,
    values: new Int16Array([10, 20, 30, 40]),
  };

  it.each([
    ['the north-west cell centre', 1.5, 0.5, 10],
    ['the south-east cell centre', 0.5, 1.5, 40],
    ['the middle of the four centres', 1, 1, 25],
    ['the north-west corner of the grid (nearest cell)', 2, 0, 10],
    ['the west edge half-way between the centres', 1, 0, 20],
  ])('gives the expected height at %s', (_label, lat, lon, expected) => {
    expect(sampleElevation(area, lat, lon)).toBeCloseTo(expected, 6);
  });

  it('reports spacing and sample positions for both registrations', () => {
    expect(getGridSpacingDeg(area)).toEqual({ lonDeg: 1, latDeg: 1 });
    expect(getSamplePosition(area, 0, 0)).toEqual({ lat: 1.5, lon: 0.5 });
    expect(getGridSpacingDeg(POINT_GRID)).toEqual({ lonDeg: 1, latDeg: 1 });
    expect(getSamplePosition(POINT_GRID, 2, 2)).toEqual({ lat: 50, lon: 12 });
  });
});

describe('grid checks and statistics', () => {
  it.each([
    ['too few columns', { width: 1, values: new Float32Array(3) }],
    ['a sample count that does not match', { values: new Float32Array(8) }],
    ['east not east of west', { east: 10 }],
    ['latitudes beyond the pole (projected metres?)', { north: 5_000_000, south: 4_000_000 }],
  ])('refuses %s', (_label, patch) => {
    expect(() => assertValidGrid({ ...POINT_GRID, ...patch } as ElevationGrid)).toThrow(ElevationDataError);
  });

  it('accepts the hand grid', () => {
    expect(() => assertValidGrid(POINT_GRID)).not.toThrow();
  });

  it('counts voids and finds the height range among real samples', () => {
    const g: ElevationGrid = { ...POINT_GRID, values: new Float32Array([-9999, 5, 7, -3, NaN, 12, 0, 1, 2]) };
    expect(getGridStats(g)).toEqual({ minM: -3, maxM: 12, nodataCount: 2 });
    expect(getGridStats({ ...g, values: new Float32Array(9).fill(-9999) })).toEqual({ minM: null, maxM: null, nodataCount: 9 });
  });

  it('measures spacing in metres on the mean sphere, east–west at the latitude nearest the equator', () => {
    // 1° × 1° at 50…52° N: east–west spacing is cos(50°) of a degree.
    expect(getGridSpacingM(POINT_GRID)).toBeCloseTo(METRES_PER_DEGREE * Math.cos((50 * Math.PI) / 180), 3);
  });

  it('gives both spacings, so a 3″ grid at 47° S reads about 63 m east–west by 93 m north–south', () => {
    const grid = { west: -129, south: -48, east: -128, north: -47, width: 1201, height: 1201, registration: 'point' as const };
    const { eastWestM, northSouthM } = getGridSpacingMetres(grid);
    // 3″ = 1/1200°: north–south 111 195 m/° ÷ 1200 = 92.66 m; east–west × cos 47° = 63.19 m (mean sphere)
    expect(northSouthM).toBeCloseTo(92.66, 1);
    expect(eastWestM).toBeCloseTo(63.19, 1);
    expect(getGridSpacingM(grid)).toBeCloseTo(eastWestM, 9);
  });
});

// SRTM .hgt format: USGS/NASA SRTM documentation and common practice, from memory —
// big-endian int16, 1201² (3") or 3601² (1"), rows north → south, −32768 voids, SW corner in the name.
describe('parseHgtName', () => {
  it.each([
    ['N45E006.hgt', 45, 6],
    ['S48W129.hgt', -48, -129],
    ['s01w001.HGT', -1, -1],
    ['N00E000.hgt', 0, 0],
    ['tiles/N27E086.SRTMGL1.hgt', 27, 86],
    ['C:\\dem\\S90W180.hgt', -90, -180],
  ])('reads the south-west corner of %s', (name, south, west) => {
    expect(parseHgtName(name)).toEqual({ south, west });
  });

  it.each(['N45E006.tif', 'X45E006.hgt', 'N4E6.hgt', 'N90E000.hgt', 'N45E180.hgt', 'elevation.hgt'])('refuses %s', (name) => {
    expect(() => parseHgtName(name)).toThrow(ElevationDataError);
  });
});

describe('parseHgt', () => {
  /** A 1201 × 1201 tile of big-endian samples: height = row * 10 + col, with a few set by hand. */
  function makeHgt(set: Record<number, number> = {}): Uint8Array {
    const n = 1201;
    const bytes = new Uint8Array(n * n * 2);
    const view = new DataView(bytes.buffer);
    for (let r = 0; r < n; r++) for (let c = 0; c < n; c++) view.setInt16((r * n + c) * 2, ((r * 10 + c) % 30000) - 100, false);
    for (const [i, v] of Object.entries(set)) view.setInt16(Number(i) * 2, v, false);
    return bytes;
  }

  it('decodes big-endian samples, rows from the north, nodes on the tile edges', () => {
    const grid = parseHgt('S48W129.hgt', makeHgt({ 0: 1234, [1201 * 1201 - 1]: -5 }));
    expect(grid).toMatchObject({ west: -129, south: -48, east: -128, north: -47, width: 1201, height: 1201, registration: 'point', nodata: HGT_NODATA });
    expect(grid.values).toBeInstanceOf(Int16Array);
    // North-west corner is the first sample, south-east the last.
    expect(sampleElevation(grid, -47, -129)).toBe(1234);
    expect(sampleElevation(grid, -48, -128)).toBe(-5);
    // Row 2, column 3 sits 2 × 3" south and 3 × 3" east of the north-west corner.
    expect(sampleElevation(grid, -47 - 2 / 1200, -129 + 3 / 1200)).toBeCloseTo(2 * 10 + 3 - 100, 6);
    expect(getGridSpacingDeg(grid).lonDeg).toBeCloseTo(1 / 1200, 12);
  });

  it('keeps −32768 as a void', () => {
    const grid = parseHgt('N10E020.hgt', makeHgt({ [1201 * 5 + 5]: -32768 }));
    expect(sampleElevation(grid, 11 - 5 / 1200, 20 + 5 / 1200)).toBeNull();
    expect(getGridStats(grid).nodataCount).toBe(1);
  });

  it('accepts the 1 arc-second size', () => {
    const grid = parseHgt('N00E000.hgt', new Uint8Array(3601 * 3601 * 2));
    expect(grid.width).toBe(3601);
  });

  it.each([0, 100, 1201 * 1201 * 2 - 2, 1201 * 1201 * 2 + 2])('refuses a file of %i bytes', (size) => {
    expect(() => parseHgt('N00E000.hgt', new Uint8Array(size))).toThrow(/1201 × 1201 or 3601 × 3601/);
  });
});

describe('sampleElevationProfile', () => {
  // A 0.1° square of point samples every 0.001° (≈111 m north–south) sloping up to the east.
  const n = 101;
  const slope: ElevationGrid = {
    id: 'slope',
    west: 10,
    south: 50,
    east: 10.1,
    north: 50.1,
    width: n,
    height: n,
    registration: 'point',
    nodata: null,
    values: Float32Array.from({ length: n * n }, (_, i) => (i % n) * 2),
  };

  it('samples at the finest grid spacing along the path, both ends included', () => {
    const from = { lat: 50.05, lon: 10.01 };
    const to = { lat: 50.05, lon: 10.09 };
    const p = sampleElevationProfile([slope], from, to);
    const spacing = getGridSpacingM(slope);
    expect(p.gridSpacingM).toBeCloseTo(spacing, 6);
    expect(p.stepM).toBeLessThanOrEqual(spacing + 1e-9);
    expect(p.points).toHaveLength(Math.ceil(getDistanceM(from, to) / spacing) + 1);
    expect(p.points[0]).toMatchObject({ distanceM: 0, lat: 50.05, lon: 10.01 });
    expect(p.points.at(-1)!.distanceM).toBeCloseTo(p.distanceM, 6);
    expect(p.points[0]!.groundM).toBeCloseTo(20, 3);
    expect(p.points.at(-1)!.groundM).toBeCloseTo(180, 3);
    expect(p.coverage).toMatchObject({ complete: true, fraction: 1, firstMissingDistanceM: null, missingRanges: [] });
    expect(p.gridIds).toEqual(['slope']);
  });

  it('caps the number of samples', () => {
    const p = sampleElevationProfile([slope], { lat: 50.01, lon: 10.01 }, { lat: 50.09, lon: 10.09 }, { maxSamples: 10 });
    expect(p.points).toHaveLength(10);
    expect(p.stepM).toBeCloseTo(p.distanceM / 9, 6);
  });

  it('reports where the path leaves the data', () => {
    // From inside the grid eastwards to 10.2° E: the second half has no data.
    const p = sampleElevationProfile([slope], { lat: 50.05, lon: 10.0 }, { lat: 50.05, lon: 10.2 });
    const firstMissing = p.points.find((q) => q.groundM === null)!;
    expect(firstMissing.lon).toBeGreaterThan(10.1);
    expect(p.coverage.complete).toBe(false);
    expect(p.coverage.fraction).toBeGreaterThan(0.45);
    expect(p.coverage.fraction).toBeLessThan(0.55);
    expect(p.coverage.firstMissingDistanceM).toBe(firstMissing.distanceM);
    expect(p.coverage.missingRanges).toHaveLength(1);
    expect(p.coverage.missingRanges[0]!.fromM).toBe(firstMissing.distanceM);
    expect(p.coverage.missingRanges[0]!.toM).toBeCloseTo(p.distanceM, 6);
  });

  it('fills a void of the finest grid from a coarser one', () => {
    const holed: ElevationGrid = { ...slope, id: 'holed', nodata: -1, values: slope.values.map((v, i) => (Math.floor(i / n) === 50 ? -1 : v)) };
    const coarse: ElevationGrid = {
      id: 'coarse',
      west: 9,
      south: 49,
      east: 11,
      north: 51,
      width: 3,
      height: 3,
      registration: 'point',
      nodata: null,
      values: new Float32Array(9).fill(7),
    };
    const along = sampleElevationProfile([coarse, holed], { lat: 50.05, lon: 10.01 }, { lat: 50.05, lon: 10.09 });
    expect(along.coverage.complete).toBe(true);
    for (const q of along.points) expect(q.groundM).toBeCloseTo(7, 9);
    expect(along.gridIds).toEqual(['coarse']);
    const across = sampleElevationProfile([coarse, holed], { lat: 50.02, lon: 10.05 }, { lat: 50.08, lon: 10.05 });
    expect(across.gridIds).toEqual(['holed', 'coarse']);
    expect(across.gridSpacingM).toBeCloseTo(getGridSpacingM(holed), 6);
  });

  it('answers an all-missing profile at the default step when no grid touches the path', () => {
    const from = { lat: 0, lon: 0 };
    const to = { lat: 0, lon: 0.01 };
    const p = sampleElevationProfile([slope], from, to);
    expect(p.gridSpacingM).toBeNull();
    expect(p.points).toHaveLength(Math.ceil(getDistanceM(from, to) / DEFAULT_PROFILE_STEP_M) + 1);
    expect(p.coverage).toMatchObject({ fraction: 0, complete: false, firstMissingDistanceM: 0, coveredCount: 0 });
    expect(p.gridIds).toEqual([]);
  });

  it('takes heights from the grids on both sides of the antimeridian', () => {
    // Two flat 0.2° grids that meet at ±180° (data spanning the antimeridian is imported as two
    // grids), and a far-away finer grid on the same latitudes that the path must not consider.
    const flat = (id: string, west: number, height: number): ElevationGrid => ({
      id,
      west,
      south: -0.1,
      east: west + 0.2,
      north: 0.1,
      width: 3,
      height: 3,
      registration: 'point',
      nodata: null,
      values: new Float32Array(9).fill(height),
    });
    const east = flat('east', 179.8, 40);
    const west = flat('west', -180, 60);
    const farFine: ElevationGrid = { ...slope, id: 'far', south: -0.05, north: 0.05, west: 0, east: 0.1 };
    const p = sampleElevationProfile([farFine, east, west], { lat: 0, lon: 179.9 }, { lat: 0, lon: -179.9 });
    expect(p.coverage.complete).toBe(true);
    expect(p.points[0]!.groundM).toBeCloseTo(40, 6);
    expect(p.points.at(-1)!.groundM).toBeCloseTo(60, 6);
    expect(new Set(p.gridIds)).toEqual(new Set(['east', 'west']));
    // The step follows the two grids' 0.1° spacing, not the far grid's 0.001°.
    expect(p.gridSpacingM).toBeCloseTo(getGridSpacingM(east), 6);
  });

  it('splits the path box at the antimeridian and keeps one box otherwise', () => {
    const across = getPathBoxes({ lat: 10, lon: 179.5 }, { lat: 11, lon: -179.5 });
    expect(across).toHaveLength(2);
    expect(across[0]).toMatchObject({ east: 180 });
    expect(across[0]!.west).toBeCloseTo(179.5, 9);
    expect(across[1]).toMatchObject({ west: -180 });
    expect(across[1]!.east).toBeCloseTo(-179.5, 9);
    const plain = getPathBoxes({ lat: 10, lon: 20 }, { lat: 11, lon: 21 });
    expect(plain).toHaveLength(1);
    expect(plain[0]!.west).toBeCloseTo(20, 9);
    expect(plain[0]!.east).toBeCloseTo(21, 9);
  });

  it('handles a zero-length path', () => {
    const here = { lat: 50.05, lon: 10.05 };
    const p = sampleElevationProfile([slope], here, here);
    expect(p.points).toHaveLength(2);
    expect(p.distanceM).toBe(0);
    expect(p.points[0]!.groundM).toBeCloseTo(100, 3);
  });
});

describe('getProfileCoverage', () => {
  it.each([
    ['all covered', [1, 2, 3], { fraction: 1, complete: true, firstMissingDistanceM: null, missingRanges: [] }],
    ['a gap in the middle', [1, null, null, 4], { fraction: 0.5, complete: false, firstMissingDistanceM: 100, missingRanges: [{ fromM: 100, toM: 200 }] }],
    [
      'two gaps',
      [null, 2, null, 4, null],
      {
        fraction: 0.4,
        complete: false,
        firstMissingDistanceM: 0,
        missingRanges: [
          { fromM: 0, toM: 0 },
          { fromM: 200, toM: 200 },
          { fromM: 400, toM: 400 },
        ],
      },
    ],
  ])('reports %s', (_label, heights, expected) => {
    const pts = heights.map((groundM, i) => ({ distanceM: i * 100, groundM }));
    expect(getProfileCoverage(pts)).toMatchObject(expected);
  });
});
