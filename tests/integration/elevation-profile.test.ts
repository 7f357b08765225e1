import { beforeEach, describe, expect, it } from 'vitest';
import { getElevationAt, getElevationProfile } from '../../src/lib/server/elevation-service';
import { importElevationFile } from '../../src/lib/server/elevation-import';
import { getGridSpacingM } from '../../src/lib/domain/elevation-grid';
import { config } from '../../src/lib/server/config';
import { getDemoElevationM } from '../../src/lib/demo/elevation';
import { DEMO_ELEVATION_FILE_NAME, buildDemoElevationTiff, seed } from '../../seeds/08_demo_elevation';
import { testDb, truncateAll } from '../helpers/db';
import { heightTiff } from '../../src/lib/demo/height-tiff';

/** A point-registered float32 GeoTIFF whose height is a plane: 1000 + 2000·(lon − west). */
function planeTiff(west: number, north: number, size: number, stepDeg: number): Uint8Array {
  return heightTiff({ west, north, step: stepDeg, width: size, height: size }, (_lat, _lon, c) => 1000 + 2000 * c * stepDeg);
}

const importTiff = (name: string, bytes: Uint8Array) => importElevationFile(testDb(), { fileName: name, bytes }, { dataDir: config.dataDir, actorId: null });

describe('getElevationProfile', () => {
  beforeEach(truncateAll);

  it('reports every sample missing when no grid is imported', async () => {
    const p = await getElevationProfile({ lat: 10, lon: 10 }, { lat: 10.01, lon: 10.01 });
    expect(p.gridSpacingM).toBeNull();
    expect(p.coverage).toMatchObject({ fraction: 0, complete: false, firstMissingDistanceM: 0 });
    expect(p.points.every((q) => q.groundM === null)).toBe(true);
  });

  it('samples covered ground at the grid spacing and reports where the data ends', async () => {
    // 0.1° square, nodes every 0.001°, over 10.0…10.1° E, 49.9…50.0° N.
    await importTiff('plane.tif', planeTiff(10, 50, 101, 0.001));
    const from = { lat: 49.95, lon: 10.02 };
    const to = { lat: 49.95, lon: 10.2 };
    const p = await getElevationProfile(from, to);
    expect(p.gridSpacingM).toBeCloseTo(getGridSpacingM({ west: 10, south: 49.9, east: 10.1, north: 50, width: 101, height: 101, registration: 'point' }), 3);
    expect(p.stepM).toBeLessThanOrEqual(p.gridSpacingM!);
    expect(p.points[0]!.groundM).toBeCloseTo(1040, 2);
    const covered = p.points.filter((q) => q.groundM !== null);
    for (const q of covered) expect(q.groundM).toBeCloseTo(1000 + 2000 * (q.lon - 10), 1);
    expect(p.coverage.complete).toBe(false);
    expect(p.coverage.fraction).toBeGreaterThan(0.4);
    expect(p.coverage.fraction).toBeLessThan(0.5);
    const firstMissing = p.points.find((q) => q.groundM === null)!;
    expect(firstMissing.lon).toBeGreaterThan(10.1);
    expect(p.coverage.firstMissingDistanceM).toBe(firstMissing.distanceM);
    expect(p.coverage.missingRanges).toHaveLength(1);
    expect(p.gridIds).toHaveLength(1);
  });

  it('joins two neighbouring grids along one path and honours maxSamples', async () => {
    await importTiff('west.tif', planeTiff(10, 50, 101, 0.001));
    await importTiff('east.tif', planeTiff(10.1, 50, 101, 0.001));
    const p = await getElevationProfile({ lat: 49.95, lon: 10.05 }, { lat: 49.95, lon: 10.15 });
    expect(p.coverage.complete).toBe(true);
    expect(p.gridIds).toHaveLength(2);
    const capped = await getElevationProfile({ lat: 49.95, lon: 10.05 }, { lat: 49.95, lon: 10.15 }, { maxSamples: 25 });
    expect(capped.points).toHaveLength(25);
  });

  it('answers a spot height, or null off the data', async () => {
    const grid = await importTiff('plane.tif', planeTiff(10, 50, 101, 0.001));
    expect(await getElevationAt({ lat: 49.95, lon: 10.05 })).toEqual({ heightM: expect.closeTo(1100, 2), gridId: grid.id });
    expect(await getElevationAt({ lat: 0, lon: 0 })).toEqual({ heightM: null, gridId: null });
  });
});

describe('demo elevation seed', () => {
  beforeEach(truncateAll);

  it('imports the island grid through the importer, heights matching the demo terrain at the nodes', async () => {
    await testDb().transaction((trx) => seed(trx));
    await testDb().transaction((trx) => seed(trx)); // idempotent
    const rows = await testDb()('elevation_grids');
    expect(rows).toHaveLength(1);
    expect(rows[0]).toMatchObject({ name: DEMO_ELEVATION_FILE_NAME, format: 'geotiff', registration: 'point', sample_type: 'float32' });
    expect(rows[0].east - rows[0].west).toBeCloseTo((rows[0].width - 1) / 1200, 9);
    expect(rows[0].max_m).toBeGreaterThan(300);
    expect(rows[0].min_m).toBe(0);
    // A node three columns and four rows in from the north-west corner, and one well inland.
    for (const [r, c] of [
      [4, 3],
      [Math.floor(rows[0].height / 2), Math.floor(rows[0].width / 2)],
    ] as const) {
      const lat = rows[0].north - r / 1200;
      const lon = rows[0].west + c / 1200;
      const { heightM } = await getElevationAt({ lat, lon });
      expect(heightM).toBeCloseTo(Math.fround(Math.max(0, getDemoElevationM(lat, lon))), 2);
    }
  });

  it('writes the same file every time', () => {
    expect(Buffer.from(buildDemoElevationTiff()).equals(Buffer.from(buildDemoElevationTiff()))).toBe(true);
  });
});
