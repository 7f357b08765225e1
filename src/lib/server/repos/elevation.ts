// Imported elevation grids.
//
// Storage: the metadata, the checksum of the uploaded file and a PostGIS bounds polygon are rows
// of elevation_grids; the decoded samples are a plain little-endian array (int16 or float32, rows
// north → south) in a file <data dir>/elevation/<sha256 of the samples>.<i16|f32>. Files rather
// than bytea keep large grids out of the database, its backups and its memory (uploads on local
// disk, metadata and checksums in the database); naming them by their checksum makes a
// file immutable, so the in-process cache can never serve stale samples, and a file is verified
// against its checksum when it is loaded. A file is written before its row and removed after its
// last row is gone, so a crash can leave an unreferenced file behind, never a row without samples.
import { createHash } from 'node:crypto';
import { mkdir, readFile, readdir, rename, rm, stat, writeFile } from 'node:fs/promises';
import { endianness } from 'node:os';
import { join } from 'node:path';
import type { Tx } from '../db';
import type { ElevationGrid, ElevationSamples } from '../../domain/elevation-grid';
import { listPointsAlong, type LatLon } from '../../domain/geodesy';
import { ELEVATION_GRID, type ElevationFormat, type ElevationGridRecord, type SampleType } from '../../schemas/elevation';
import { NotFoundError } from '../errors';
import { recordAudit } from './audit';
import { recordColumns } from './record-sql';

export type { ElevationGridRecord, SampleType };

function selectGrids(db: Tx) {
  return db('elevation_grids as g')
    .leftJoin('users as u', 'u.id', 'g.uploaded_by')
    .select(recordColumns(db, ELEVATION_GRID, 'g'));
}

export async function listElevationGrids(db: Tx): Promise<ElevationGridRecord[]> {
  const rows: Record<string, unknown>[] = await selectGrids(db).orderBy([{ column: 'g.name' }, { column: 'g.id' }]);
  return rows.map((r) => ELEVATION_GRID.fromRow(r));
}

export async function findElevationGrid(db: Tx, id: string): Promise<ElevationGridRecord> {
  const row: Record<string, unknown> | undefined = await selectGrids(db).where('g.id', id).first();
  if (!row) throw new NotFoundError('Elevation grid not found');
  return ELEVATION_GRID.fromRow(row);
}

export async function findElevationGridBySha256(db: Tx, sha256: string): Promise<ElevationGridRecord | null> {
  const row: Record<string, unknown> | undefined = await selectGrids(db).where('g.sha256', sha256).first();
  return row ? ELEVATION_GRID.fromRow(row) : null;
}

/** Grids whose bounds meet the great-circle path from `from` to `to` (or the point, when they are equal). */
export async function findGridsCovering(db: Tx, from: LatLon, to: LatLon): Promise<ElevationGridRecord[]> {
  const same = from.lat === to.lat && from.lon === to.lon;
  const geometry = same
    ? { type: 'Point', coordinates: [from.lon, from.lat] }
    : { type: 'LineString', coordinates: listPointsAlong(from, to, 17).map((p) => [p.lon, p.lat]) };
  const rows: Record<string, unknown>[] = await selectGrids(db)
    .whereRaw('ST_Intersects(g.bounds, ST_SetSRID(ST_GeomFromGeoJSON(?), 4326))', [JSON.stringify(geometry)])
    .orderBy('g.id');
  return rows.map((r) => ELEVATION_GRID.fromRow(r));
}

/** Grids meeting a longitude/latitude box (west, south, east, north). */
export async function findGridsInBox(db: Tx, box: readonly [number, number, number, number]): Promise<ElevationGridRecord[]> {
  const rows: Record<string, unknown>[] = await selectGrids(db)
    .whereRaw('ST_Intersects(g.bounds, ST_MakeEnvelope(?, ?, ?, ?, 4326))', [...box])
    .orderBy('g.id');
  return rows.map((r) => ELEVATION_GRID.fromRow(r));
}

export async function findGridsAt(db: Tx, point: LatLon): Promise<ElevationGridRecord[]> {
  return findGridsCovering(db, point, point);
}

export interface NewElevationGrid {
  name: string;
  format: ElevationFormat;
  sha256: string;
  byteSize: number;
  grid: Omit<ElevationGrid, 'values' | 'id'>;
  sampleType: SampleType;
  stats: { minM: number | null; maxM: number | null; nodataCount: number };
  samplesFile: string;
  samplesSha256: string;
}

export async function insertElevationGrid(db: Tx, input: NewElevationGrid, actorId: string | null): Promise<ElevationGridRecord> {
  const { grid } = input;
  const [inserted] = await db('elevation_grids')
    .insert({
      ...ELEVATION_GRID.insertRow({ ...input, ...grid, ...input.stats }),
      bounds: db.raw('ST_MakeEnvelope(?, ?, ?, ?, 4326)', [grid.west, grid.south, grid.east, grid.north]),
      uploaded_by: actorId,
    })
    .returning('id');
  const record = await findElevationGrid(db, String(inserted.id));
  await recordAudit(db, { userId: actorId, action: 'create', entity: 'elevation_grid', entityId: record.id, after: auditView(record) });
  return record;
}

/** Deletes the row (audited) and returns it; the caller removes the samples file after commit. */
export async function deleteElevationGrid(db: Tx, id: string, actorId: string): Promise<ElevationGridRecord> {
  const record = await findElevationGrid(db, id);
  await db('elevation_grids').where({ id }).delete();
  await recordAudit(db, { userId: actorId, action: 'delete', entity: 'elevation_grid', entityId: id, before: auditView(record) });
  return record;
}

function auditView(r: ElevationGridRecord) {
  return { name: r.name, format: r.format, sha256: r.sha256, bbox: [r.west, r.south, r.east, r.north], width: r.width, height: r.height };
}

// ── Samples files ────────────────────────────────────────────────────────────────────────

const SAMPLES_FOLDER = 'elevation';
const EXTENSION: Record<SampleType, string> = { int16: 'i16', float32: 'f32' };

export function getSampleType(values: ElevationSamples): SampleType {
  return values instanceof Int16Array ? 'int16' : 'float32';
}

function assertLittleEndianHost(): void {
  // The files are the typed arrays' memory as is; every platform the app runs on is little-endian.
  if (endianness() !== 'LE') throw new Error('Elevation sample files assume a little-endian host');
}

export function sha256Hex(bytes: Uint8Array): string {
  return createHash('sha256').update(bytes).digest('hex');
}

/** Writes the samples (atomically, named by checksum) and returns the file name and checksum. */
export async function writeSamplesFile(dataDir: string, values: ElevationSamples): Promise<{ file: string; sha256: string }> {
  assertLittleEndianHost();
  const bytes = new Uint8Array(values.buffer, values.byteOffset, values.byteLength);
  const sha256 = sha256Hex(bytes);
  const file = `${sha256}.${EXTENSION[getSampleType(values)]}`;
  const folder = join(dataDir, SAMPLES_FOLDER);
  await mkdir(folder, { recursive: true });
  const temporary = join(folder, `.${file}.${process.pid}.${Date.now()}.part`);
  await writeFile(temporary, bytes);
  await rename(temporary, join(folder, file));
  return { file, sha256 };
}

/**
 * Removes a samples file unless some grid still refers to it (two uploads can decode to the same
 * samples). Call after the deleting transaction has committed.
 */
export async function removeSamplesFileIfUnused(db: Tx, dataDir: string, file: string): Promise<void> {
  const used = await db('elevation_grids').where({ samples_file: file }).first('id');
  if (used) return;
  await rm(join(dataDir, SAMPLES_FOLDER, file), { force: true });
}

/** Partly written samples files older than this are left over from a crash. */
const STALE_PART_MS = 60 * 60 * 1000;

/**
 * Removes samples files that no grid refers to: left behind when the app stopped between a
 * delete's commit and the file's removal, or by an interrupted upload. Returns the names removed.
 */
export async function removeOrphanSampleFiles(db: Tx, dataDir: string, now = Date.now()): Promise<string[]> {
  const folder = join(dataDir, SAMPLES_FOLDER);
  let names: string[];
  try {
    names = await readdir(folder);
  } catch {
    return [];
  }
  const used = new Set<string>(await db('elevation_grids').pluck('samples_file'));
  const removed: string[] = [];
  for (const name of names) {
    if (used.has(name)) continue;
    if (name.endsWith('.part') && now - (await stat(join(folder, name))).mtimeMs < STALE_PART_MS) continue; // an upload in progress
    await rm(join(folder, name), { force: true });
    removed.push(name);
  }
  return removed.sort();
}

// In-process cache of loaded samples, keyed by their checksum and bounded by size (least recently
// used goes first). Sized for a handful of 1 arc-second tiles (~26–52 MB each).
export const CACHE_LIMIT_BYTES = 512 * 1024 * 1024;
const cache = new Map<string, ElevationSamples>();
const loading = new Map<string, Promise<ElevationSamples>>();
let cachedBytes = 0;

function remember(key: string, values: ElevationSamples): void {
  cache.set(key, values);
  cachedBytes += values.byteLength;
  for (const [k, v] of cache) {
    if (cachedBytes <= CACHE_LIMIT_BYTES || k === key) break;
    cache.delete(k);
    cachedBytes -= v.byteLength;
  }
}

/** Bytes a grid's samples take in memory (and in the cache). */
export function getSamplesBytes(record: Pick<ElevationGridRecord, 'width' | 'height' | 'sampleType'>): number {
  return record.width * record.height * (record.sampleType === 'int16' ? 2 : 4);
}

async function readSamples(record: ElevationGridRecord, dataDir: string): Promise<ElevationSamples> {
  assertLittleEndianHost();
  const path = join(dataDir, SAMPLES_FOLDER, record.samplesFile);
  const buffer = await readFile(path);
  if (buffer.byteLength !== getSamplesBytes(record)) {
    throw new Error(`Elevation samples ${path} have ${buffer.byteLength} bytes; ${getSamplesBytes(record)} expected`);
  }
  if (sha256Hex(buffer) !== record.samplesSha256) throw new Error(`Elevation samples ${path} do not match their checksum`);
  // A fresh, aligned copy: Buffers may start at any offset of a shared pool.
  const copy = new Uint8Array(buffer.byteLength);
  copy.set(buffer);
  return record.sampleType === 'int16' ? new Int16Array(copy.buffer) : new Float32Array(copy.buffer);
}

/** The grid with its samples, from the cache or the samples file (verified against its checksum). */
export async function loadElevationGrid(record: ElevationGridRecord, dataDir: string): Promise<ElevationGrid> {
  const key = record.samplesSha256;
  let values = cache.get(key);
  if (values) {
    cache.delete(key);
    cache.set(key, values);
  } else {
    let pending = loading.get(key);
    if (!pending) {
      pending = readSamples(record, dataDir).finally(() => loading.delete(key));
      loading.set(key, pending);
      values = await pending;
      if (!cache.has(key)) remember(key, values);
    } else {
      values = await pending;
    }
  }
  const { id, west, south, east, north, width, height, registration, nodata } = record;
  return { id, west, south, east, north, width, height, registration, nodata, values };
}
