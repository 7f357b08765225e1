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
import {
  getGridSpacingDeg,
  getGridSpacingM,
  getGridSpacingMetres,
  type ElevationGrid,
  type ElevationSamples,
  type GridRegistration,
} from '../../domain/elevation-grid';
import { listPointsAlong, type LatLon } from '../../domain/geodesy';
import type { ElevationFormat, ElevationGridJson } from '../../schemas/elevation';
import { NotFoundError } from '../errors';
import { recordAudit } from './audit';

export type SampleType = 'int16' | 'float32';

export interface ElevationGridRecord {
  id: string;
  name: string;
  format: ElevationFormat;
  sha256: string;
  byteSize: number;
  width: number;
  height: number;
  registration: GridRegistration;
  west: number;
  south: number;
  east: number;
  north: number;
  nodata: number | null;
  sampleType: SampleType;
  minM: number | null;
  maxM: number | null;
  nodataCount: number;
  samplesFile: string;
  samplesSha256: string;
  uploadedBy: { id: string; name: string } | null;
  createdAt: Date;
}

interface ElevationGridRow {
  id: string;
  name: string;
  format: ElevationFormat;
  sha256: string;
  byte_size: string | number;
  width: number;
  height: number;
  registration: GridRegistration;
  west: number;
  south: number;
  east: number;
  north: number;
  nodata: number | null;
  sample_type: SampleType;
  min_m: number | null;
  max_m: number | null;
  nodata_count: string | number;
  samples_file: string;
  samples_sha256: string;
  uploaded_by: string | null;
  uploaded_by_name?: string | null;
  created_at: Date;
}

function toRecord(r: ElevationGridRow): ElevationGridRecord {
  return {
    id: String(r.id),
    name: r.name,
    format: r.format,
    sha256: r.sha256,
    byteSize: Number(r.byte_size),
    width: r.width,
    height: r.height,
    registration: r.registration,
    west: r.west,
    south: r.south,
    east: r.east,
    north: r.north,
    nodata: r.nodata,
    sampleType: r.sample_type,
    minM: r.min_m,
    maxM: r.max_m,
    nodataCount: Number(r.nodata_count),
    samplesFile: r.samples_file,
    samplesSha256: r.samples_sha256,
    uploadedBy: r.uploaded_by === null ? null : { id: String(r.uploaded_by), name: r.uploaded_by_name ?? '' },
    createdAt: r.created_at,
  };
}

const COLUMNS = [
  'g.id',
  'g.name',
  'g.format',
  'g.sha256',
  'g.byte_size',
  'g.width',
  'g.height',
  'g.registration',
  'g.west',
  'g.south',
  'g.east',
  'g.north',
  'g.nodata',
  'g.sample_type',
  'g.min_m',
  'g.max_m',
  'g.nodata_count',
  'g.samples_file',
  'g.samples_sha256',
  'g.uploaded_by',
  'u.name as uploaded_by_name',
  'g.created_at',
];

function selectGrids(db: Tx) {
  return db<ElevationGridRow>({ g: 'elevation_grids' }).leftJoin({ u: 'users' }, 'u.id', 'g.uploaded_by').select(COLUMNS);
}

export async function listElevationGrids(db: Tx): Promise<ElevationGridRecord[]> {
  const rows: ElevationGridRow[] = await selectGrids(db).orderBy([{ column: 'g.name' }, { column: 'g.id' }]);
  return rows.map(toRecord);
}

export async function findElevationGrid(db: Tx, id: string): Promise<ElevationGridRecord> {
  const row: ElevationGridRow | undefined = await selectGrids(db).where('g.id', id).first();
  if (!row) throw new NotFoundError('Elevation grid not found');
  return toRecord(row);
}

export async function findElevationGridBySha256(db: Tx, sha256: string): Promise<ElevationGridRecord | null> {
  const row: ElevationGridRow | undefined = await selectGrids(db).where('g.sha256', sha256).first();
  return row ? toRecord(row) : null;
}

/** Grids whose bounds meet the great-circle path from `from` to `to` (or the point, when they are equal). */
export async function findGridsCovering(db: Tx, from: LatLon, to: LatLon): Promise<ElevationGridRecord[]> {
  const same = from.lat === to.lat && from.lon === to.lon;
  const geometry = same
    ? { type: 'Point', coordinates: [from.lon, from.lat] }
    : { type: 'LineString', coordinates: listPointsAlong(from, to, 17).map((p) => [p.lon, p.lat]) };
  const rows: ElevationGridRow[] = await selectGrids(db)
    .whereRaw('ST_Intersects(g.bounds, ST_SetSRID(ST_GeomFromGeoJSON(?), 4326))', [JSON.stringify(geometry)])
    .orderBy('g.id');
  return rows.map(toRecord);
}

/** Grids meeting a longitude/latitude box (west, south, east, north). */
export async function findGridsInBox(db: Tx, box: readonly [number, number, number, number]): Promise<ElevationGridRecord[]> {
  const rows: ElevationGridRow[] = await selectGrids(db)
    .whereRaw('ST_Intersects(g.bounds, ST_MakeEnvelope(?, ?, ?, ?, 4326))', [...box])
    .orderBy('g.id');
  return rows.map(toRecord);
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
      name: input.name,
      format: input.format,
      sha256: input.sha256,
      byte_size: input.byteSize,
      width: grid.width,
      height: grid.height,
      registration: grid.registration,
      west: grid.west,
      south: grid.south,
      east: grid.east,
      north: grid.north,
      nodata: grid.nodata,
      sample_type: input.sampleType,
      min_m: input.stats.minM,
      max_m: input.stats.maxM,
      nodata_count: input.stats.nodataCount,
      samples_file: input.samplesFile,
      samples_sha256: input.samplesSha256,
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

const round = (n: number, d: number) => Math.round(n * 10 ** d) / 10 ** d;

export function elevationGridJson(r: ElevationGridRecord): ElevationGridJson {
  const spacing = getGridSpacingDeg(r);
  return {
    id: r.id,
    name: r.name,
    format: r.format,
    bbox: [r.west, r.south, r.east, r.north],
    width: r.width,
    height: r.height,
    registration: r.registration,
    resolution_arcsec: { lon: round(spacing.lonDeg * 3600, 4), lat: round(spacing.latDeg * 3600, 4) },
    resolution_m: round(getGridSpacingM(r), 1),
    resolution_ew_m: round(getGridSpacingMetres(r).eastWestM, 1),
    resolution_ns_m: round(getGridSpacingMetres(r).northSouthM, 1),
    sample_type: r.sampleType,
    nodata: r.nodata,
    nodata_count: r.nodataCount,
    min_m: r.minM,
    max_m: r.maxM,
    byte_size: r.byteSize,
    sha256: r.sha256,
    uploaded_by: r.uploadedBy,
    created_at: r.createdAt.toISOString(),
  };
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
const CACHE_LIMIT_BYTES = 512 * 1024 * 1024;
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

async function readSamples(record: ElevationGridRecord, dataDir: string): Promise<ElevationSamples> {
  assertLittleEndianHost();
  const path = join(dataDir, SAMPLES_FOLDER, record.samplesFile);
  const buffer = await readFile(path);
  const perSample = record.sampleType === 'int16' ? 2 : 4;
  if (buffer.byteLength !== record.width * record.height * perSample) {
    throw new Error(`Elevation samples ${path} have ${buffer.byteLength} bytes; ${record.width * record.height * perSample} expected`);
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
