// The residual job: computes and stores the model residual of every matched reading that has none
// (new readings, readings whose cell or mast changed — triggers clear those — and all of them after
// the elevation data or the model changed). The shortlist reads the stored residuals and computes
// only the ones this job has not reached yet, so the result never depends on the job being current.
import type { Knex } from 'knex';
import { sampleElevationProfile, type ElevationGrid } from '../domain/elevation-grid';
import type { LatLon } from '../domain/geodesy';
import { findGridsInBox, loadElevationGrid } from './repos/elevation';
import { listCandidateCellsByIds, toMeasuredReading, type MeasuredReadingRow } from './repos/candidates';
import { computeResidualDb, getResidualBasis, type ProfileProvider } from './shortlist-service';

export interface ResidualJobOptions {
  /** Where the elevation samples live (the app's DATA_DIR). */
  dataDir: string;
  /** Readings per batch (each batch is one read and one write). */
  batchSize?: number;
  /** Stop after this many batches (the background loop does a little at a time). */
  maxBatches?: number;
  /** Only readings inside this box (west, south, east, north), e.g. to bring one area up to date first. */
  box?: readonly [number, number, number, number];
}

type TodoRow = MeasuredReadingRow & { id: string };

function boxAround(points: LatLon[]): [number, number, number, number] {
  const lats = points.map((p) => p.lat);
  const lons = points.map((p) => p.lon);
  return [Math.min(...lons), Math.min(...lats), Math.max(...lons), Math.max(...lats)];
}

async function samplerFor(db: Knex, points: LatLon[], dataDir: string): Promise<ProfileProvider> {
  const records = await findGridsInBox(db, boxAround(points));
  const grids: ElevationGrid[] = [];
  for (const r of records) {
    try {
      grids.push(await loadElevationGrid(r, dataDir));
    } catch (err) {
      console.error(`[bearline] elevation grid ${r.id} (${r.name}) could not be loaded`, err);
    }
  }
  return async (from, to, options) => sampleElevationProfile(grids, from, to, { maxSamples: options.maxSamples });
}

let lastClearedBasis: string | null = null;

/** Runs batches until nothing is left (or maxBatches); returns how many readings got a residual. */
export async function refreshResiduals(db: Knex, options: ResidualJobOptions): Promise<number> {
  const batchSize = options.batchSize ?? 2000;
  const basis = await getResidualBasis(db);
  // Residuals of an older model or elevation data are missing ones (looked for once per basis and
  // process: it reads the whole table).
  if (basis !== lastClearedBasis) {
    await db('readings').whereNotNull('residual_basis').whereNot('residual_basis', basis).update({ model_residual_db: null, residual_basis: null });
    lastClearedBasis = basis;
  }
  let done = 0;
  for (let batch = 0; batch < (options.maxBatches ?? Infinity); batch++) {
    const { rows } = await db.raw<{ rows: TodoRow[] }>(
      `SELECT id, cell_id, ST_Y(geom) AS lat, ST_X(geom) AS lon, rsrp_dbm, antenna_gain_dbi, height_m
         FROM readings
        WHERE residual_basis IS NULL AND cell_id IS NOT NULL AND rsrp_dbm IS NOT NULL
          ${options.box ? 'AND geom && ST_MakeEnvelope(?, ?, ?, ?, 4326)' : ''}
        ORDER BY cell_id, id
        LIMIT ?`,
      [...(options.box ?? []), batchSize],
    );
    if (rows.length === 0) break;
    const cells = new Map((await listCandidateCellsByIds(db, [...new Set(rows.map((r) => String(r.cell_id)))])).map((c) => [c.cellId, c]));
    const positions = rows.map((r) => ({ lat: r.lat, lon: r.lon }));
    const profileFor = await samplerFor(db, [...positions, ...[...cells.values()].map((c) => c.mastPosition)], options.dataDir);
    const ids: string[] = [];
    const cellIds: string[] = [];
    const residuals: Array<number | null> = [];
    for (const r of rows) {
      const cell = cells.get(String(r.cell_id));
      ids.push(String(r.id));
      cellIds.push(String(r.cell_id));
      // A cell without a frequency cannot be modelled: its readings are marked done without a residual.
      residuals.push(cell ? await computeResidualDb(cell, toMeasuredReading(r), profileFor) : null);
    }
    // Only rows still as read: a reading re-matched meanwhile keeps its cleared residual for the next run.
    await db.raw(
      `UPDATE readings r SET model_residual_db = v.residual, residual_basis = ?
         FROM unnest(?::bigint[], ?::bigint[], ?::float8[]) AS v(id, cell_id, residual)
        WHERE r.id = v.id AND r.cell_id = v.cell_id AND r.residual_basis IS NULL`,
      [basis, ids, cellIds, residuals] as unknown as readonly Knex.RawBinding[],
    );
    done += rows.length;
    if (rows.length < batchSize) break;
  }
  return done;
}

/** Lock id of a round, so one at a time does the work (the benchmark may run the job itself). */
const RESIDUAL_JOB_LOCK = 0x6265_6172; // 'bear'

/**
 * One round of the background job: a few batches under a lock, skipped while another round holds it.
 * Run every 10 s by one app instance (background.ts). Returns the readings done.
 */
export async function runResidualRound(db: Knex, dataDir: string): Promise<number> {
  return db.transaction(async (trx) => {
    const { rows } = await trx.raw<{ rows: Array<{ got: boolean }> }>('SELECT pg_try_advisory_xact_lock(?) AS got', [RESIDUAL_JOB_LOCK]);
    return rows[0]?.got ? refreshResiduals(trx, { dataDir, maxBatches: 5 }) : 0;
  });
}
