// Elevation for the app: terrain profiles and spot heights from the imported grids, plus the
// upload and delete flows. Grids whose samples cannot be read are left out (and logged), so a
// damaged file shows up as missing data rather than as a failed shortlist.
import { sampleElevationProfile, type ElevationGrid, type ElevationProfile, type ProfileOptions } from '../domain/elevation-grid';
import type { LatLon } from '../domain/geodesy';
import { config } from './config';
import { getDb } from './db';
import { getDataVersion } from './data-version';
import { importElevationFile, type ElevationUpload } from './elevation-import';
import {
  deleteElevationGrid,
  findGridsCovering,
  listElevationGrids,
  loadElevationGrid,
  removeSamplesFileIfUnused,
  CACHE_LIMIT_BYTES,
  getSamplesBytes,
  type ElevationGridRecord,
} from './repos/elevation';

export type { ElevationProfile, ElevationProfilePoint, ProfileCoverage } from '../domain/elevation-grid';

async function loadGrids(records: ElevationGridRecord[]): Promise<ElevationGrid[]> {
  const loaded = await Promise.all(
    records.map((r) =>
      loadElevationGrid(r, config.dataDir).catch((err: unknown) => {
        console.error(`[bearline] elevation grid ${r.id} (${r.name}) could not be loaded`, err);
        return null;
      }),
    ),
  );
  return loaded.filter((g): g is ElevationGrid => g !== null);
}

/**
 * Ground heights along the great circle from `from` to `to` at the finest available grid spacing
 * (at most `maxSamples` samples), with the coverage report: `groundM` is null where no grid has data.
 */
export async function getElevationProfile(from: LatLon, to: LatLon, options: Pick<ProfileOptions, 'maxSamples'> = {}): Promise<ElevationProfile> {
  const grids = await loadGrids(await findGridsCovering(getDb(), from, to));
  return sampleElevationProfile(grids, from, to, { maxSamples: options.maxSamples });
}

type Box = readonly [west: number, south: number, east: number, north: number];

/** Every grid's record as of one elevation data version: a handful of rows, read once per version. */
let gridRecords: { version: string; records: Promise<ElevationGridRecord[]> } | null = null;

async function listGridRecords(): Promise<ElevationGridRecord[]> {
  const db = getDb();
  const version = await getDataVersion(db, 'elevation');
  if (gridRecords?.version !== version) {
    const records = listElevationGrids(db).then((list) => [...list].sort((a, b) => Number(a.id) - Number(b.id)));
    gridRecords = { version, records };
    records.catch(() => {
      if (gridRecords?.records === records) gridRecords = null;
    });
  }
  return gridRecords.records;
}

/** Grids whose bounds meet the box (edges touching count, as ST_Intersects has it), in id order. */
export function selectGridsInBox<T extends Pick<ElevationGridRecord, 'west' | 'south' | 'east' | 'north'>>(
  records: readonly T[],
  [west, south, east, north]: Box,
): T[] {
  return records.filter((r) => r.west <= east && west <= r.east && r.south <= north && south <= r.north);
}

/**
 * A profile sampler over one area: the grids meeting the box are loaded once, so many profiles
 * inside it (a shortlist and its calibration readings) cost no further queries. The grid list comes
 * from memory while the elevation data version stands.
 */
export async function getAreaProfileSampler(
  box: Box,
): Promise<(from: LatLon, to: LatLon, options?: Pick<ProfileOptions, 'maxSamples'>) => Promise<ElevationProfile>> {
  const grids = await loadGrids(selectGridsInBox(await listGridRecords(), box));
  return async (from, to, options = {}) => sampleElevationProfile(grids, from, to, { maxSamples: options.maxSamples });
}

/**
 * Reads the grids' samples into the in-process cache at start, so a first shortlist does not wait for
 * them: as many as fill half the cache (the rest load when a path needs them). Returns how many.
 */
export async function warmElevationGrids(): Promise<number> {
  const records = await listGridRecords();
  let bytes = 0;
  const fitting = records.filter((r) => (bytes += getSamplesBytes(r)) <= CACHE_LIMIT_BYTES / 2);
  return (await loadGrids(fitting)).length;
}

/** Ground height at one point from the finest grid with data there, or null. */
export async function getElevationAt(point: LatLon): Promise<{ heightM: number | null; gridId: string | null }> {
  const profile = await getElevationProfile(point, point, { maxSamples: 2 });
  const heightM = profile.points[0]?.groundM ?? null;
  return { heightM, gridId: heightM === null ? null : (profile.gridIds[0] ?? null) };
}

export async function importUploadedElevation(upload: ElevationUpload, actorId: string): Promise<ElevationGridRecord> {
  return importElevationFile(getDb(), upload, { dataDir: config.dataDir, actorId });
}

export async function removeElevationGrid(id: string, actorId: string): Promise<void> {
  const db = getDb();
  const removed = await db.transaction((trx) => deleteElevationGrid(trx, id, actorId));
  await removeSamplesFileIfUnused(db, config.dataDir, removed.samplesFile);
}
