// Demo elevation: the invented island's ground on a 3 arc-second grid, written as a GeoTIFF and
// imported through the same importer as an admin's upload (so the seed exercises it end to end).
import type { Knex } from 'knex';
import { resolve } from 'node:path';
import { getDemoElevationM, getDemoIsland, getIslandBounds } from '../src/lib/demo/elevation';
import { heightTiff } from '../src/lib/demo/height-tiff';
import { importElevationFile } from '../src/lib/server/elevation-import';
import { removeOrphanSampleFiles } from '../src/lib/server/repos/elevation';
import { ROOT } from '../scripts/lib/project';

export const DEMO_ELEVATION_FILE_NAME = 'marrowen-dem-3arcsec.tif';
/** Grid nodes per degree: 3 arc-second spacing, a common DEM resolution. */
export const DEMO_ELEVATION_NODES_PER_DEGREE = 1200;
const MARGIN_KM = 3;

/**
 * The island plus a margin of sea as a float32 GeoTIFF (EPSG:4326, PixelIsPoint: nodes on whole
 * multiples of 3″, like SRTM). The sea surface, not the sea floor, is the ground a radio path meets,
 * so heights below 0 are written as 0.
 */
export function buildDemoElevationTiff(): Uint8Array {
  const n = DEMO_ELEVATION_NODES_PER_DEGREE;
  const b = getIslandBounds(getDemoIsland(), MARGIN_KM);
  const west = Math.floor(b.west * n) / n;
  const east = Math.ceil(b.east * n) / n;
  const south = Math.floor(b.south * n) / n;
  const north = Math.ceil(b.north * n) / n;
  const width = Math.round((east - west) * n) + 1;
  const height = Math.round((north - south) * n) + 1;
  // Positions as r/n and c/n from the corner, as the demo grid has always been written (r·(1/n) may differ in the last bit).
  return heightTiff({ west, north, step: 1 / n, width, height, noData: -32768 }, (_lat, _lon, c, r) =>
    Math.max(0, getDemoElevationM(north - r / n, west + c / n)),
  );
}

/** The app's data folder, read when the seed runs (test runs set DATA_DIR just before seeding). */
function getDataDir(): string {
  return process.env.DATA_DIR ? resolve(process.env.DATA_DIR) : resolve(ROOT, '.data');
}

export async function seed(knex: Knex): Promise<void> {
  const dataDir = getDataDir();
  await knex('elevation_grids').delete();
  await importElevationFile(knex, { fileName: DEMO_ELEVATION_FILE_NAME, bytes: buildDemoElevationTiff() }, { dataDir, actorId: null });
  // The demo grid is deterministic, so it usually reuses its own file; every other samples file goes.
  await removeOrphanSampleFiles(knex, dataDir);
}
