// Survey-log import. While the upload streams in: papaparse → row checks (measurement ranges,
// band tables) → COPY into reading_import_rows, and the job is queued in the same transaction.
// The job (any instance): match each row to a cell by technology + channel + PCI near it, then
// move every row into readings with one INSERT … SELECT in the transaction that marks the import
// done — all or nothing, and a retried job finds the import either untouched or done.
// No astro:env here: the app, scripts and benchmarks pass their own Knex and queue.
import { randomUUID } from 'node:crypto';
import type { Knex } from 'knex';
import type { Readable } from 'node:stream';
import type PgBoss from 'pg-boss';
import { READING_CSV_COLUMNS, checkReadingCsvHeader, checkReadingCsvRow, type ReadingCsvRow } from '../domain/reading-csv';
import { camel } from '../schemas/record';
import { allowLongStatements, connectionOf, copyCsvIntoTable, type CopyValue, type RowCheck } from './csv-copy';
import { AppError, ValidationError } from './errors';
import { hashingStream } from './hashing-stream';
import { rowProblemsError } from './import-report';
import { PermanentJobError, READINGS_IMPORT_QUEUE, sendJobInTransaction, type JobContext, type JobOutcome } from './jobs/queue';
import { recordAudit } from './repos/audit';

/** A reading matches a cell of the same technology, channel and PCI on a mast at most this far away (common practice). */
export const CELL_MATCH_RADIUS_M = 30_000;

/** A checked row is staged under its CSV column names (`time` as `taken_at`). */
const STAGED_FIELDS = READING_CSV_COLUMNS.map(({ name }) =>
  name === 'time' ? { column: 'taken_at', key: 'takenAt' as const } : { column: name, key: camel(name) as keyof ReadingCsvRow },
);
const STAGING_COLUMNS = ['import_id', 'line', ...STAGED_FIELDS.map((f) => f.column)];

function stagedValues(r: ReadingCsvRow): CopyValue[] {
  return STAGED_FIELDS.map(({ key }) => {
    const v = r[key];
    return v instanceof Date ? v.toISOString() : v;
  });
}

export interface StagedImport {
  importId: string;
  jobId: string;
  rows: number;
}

/**
 * Checks and stages an uploaded survey log and queues its job, in `trx`. Throws 422 with
 * `fields` "line N" → reasons when any row is bad (nothing is staged or queued then).
 */
export async function stageReadingsUpload(
  trx: Knex.Transaction,
  boss: PgBoss,
  input: Readable,
  meta: { fileName: string | null; ownerId: string | null; now: Date },
): Promise<StagedImport> {
  // A large upload takes longer than the default statement timeout.
  await allowLongStatements(trx, 30);
  const [{ id: importId }] = await trx('reading_imports').insert({ owner_id: meta.ownerId, file_name: meta.fileName }).returning<{ id: string }[]>('id');
  const hashed = hashingStream(input);
  const conn = await connectionOf(trx);
  const copied = await copyCsvIntoTable(conn, hashed.stream, {
    table: 'reading_import_rows',
    columns: STAGING_COLUMNS,
    checkHeader: checkReadingCsvHeader,
    checkRow: (record, line): RowCheck => {
      const check = checkReadingCsvRow(record, meta.now);
      if (!check.ok) return check;
      return { ok: true, values: [importId, line, ...stagedValues(check.row)] };
    },
  });
  if (hashed.bytes() === 0) throw new ValidationError('The file is empty', { file: ['The file is empty'] });
  if (copied.fileErrors.length) throw new AppError('UNPROCESSABLE_CONTENT', copied.fileErrors[0]!, { file: copied.fileErrors });
  if (copied.errorCount) throw rowProblemsError(copied.errorCount, copied.errors);

  const jobId = randomUUID();
  await trx('reading_imports').where({ id: importId }).update({ job_id: jobId, rows: copied.rows, bytes: hashed.bytes(), sha256: hashed.sha256() });
  await sendJobInTransaction(boss, trx, conn, {
    id: jobId,
    queue: READINGS_IMPORT_QUEUE,
    ownerId: meta.ownerId,
    title: `Readings import${meta.fileName ? ` of ${meta.fileName}` : ''} (${copied.rows} rows)`,
    data: { importId },
    counts: { rows: copied.rows },
  });
  return { importId: String(importId), jobId, rows: copied.rows };
}

export interface RunImportOptions {
  /** Rows matched per statement (progress steps); default 20 000. */
  batchRows?: number;
}

/** The job: match cells in batches (progress 0–90), then move everything in one transaction. */
export async function runReadingsImport(db: Knex, importId: string, ctx: JobContext, opts: RunImportOptions = {}): Promise<JobOutcome> {
  const batch = opts.batchRows ?? 20_000;
  const imp = await db('reading_imports')
    .where({ id: importId })
    .first<
      { id: string; status: string; rows: number; owner_id: string | null; file_name: string | null; sha256: string | null; matched: number } | undefined
    >();
  if (!imp) throw new PermanentJobError('The import is gone (its upload was removed)');
  if (imp.status === 'done') {
    // An earlier attempt committed but did not get to report it.
    return {
      counts: { rows: imp.rows, imported: imp.rows, matched: imp.matched },
      message: `Imported ${imp.rows} readings (${imp.matched} matched to cells)`,
    };
  }
  const { rows: bounds } = await db.raw<{ rows: Array<{ lo: number | null; hi: number | null; n: string }> }>(
    'SELECT min(line) AS lo, max(line) AS hi, count(*) AS n FROM reading_import_rows WHERE import_id = ?',
    [importId],
  );
  const { lo, hi } = bounds[0]!;
  if (Number(bounds[0]!.n) !== imp.rows || lo === null || hi === null) {
    throw new PermanentJobError('The staged rows of this import are incomplete (the database restarted); upload the file again');
  }

  await ctx.progress(0, 'matching cells', { rows: imp.rows });
  for (let from = lo; from <= hi; from += batch) {
    await db.transaction(async (trx) => {
      await trx.raw("SET LOCAL statement_timeout = '10min'");
      await trx.raw(
        `UPDATE reading_import_rows s SET cell_id = (
         SELECT c.id FROM cells c JOIN masts m ON m.id = c.mast_id JOIN operators o ON o.id = c.operator_id
          WHERE c.tech = s.tech AND c.channel = s.channel AND c.pci = s.pci
            AND (s.mcc IS NULL OR (o.mcc = s.mcc AND o.mnc = s.mnc))
            AND ST_DWithin(m.geom::geography, ST_SetSRID(ST_MakePoint(s.lon, s.lat), 4326)::geography, ?)
          ORDER BY m.status = 'decommissioned', m.geom <-> ST_SetSRID(ST_MakePoint(s.lon, s.lat), 4326), c.id
          LIMIT 1)
        WHERE s.import_id = ? AND s.line >= ? AND s.line < ? AND s.pci IS NOT NULL`,
        [CELL_MATCH_RADIUS_M, importId, from, from + batch],
      );
    });
    await ctx.progress((90 * (Math.min(hi, from + batch) - lo + 1)) / (hi - lo + 1), 'matching cells', { rows: imp.rows });
  }

  await ctx.progress(90, 'storing readings', { rows: imp.rows });
  const outcome = await db.transaction(async (trx) => {
    await trx.raw("SET LOCAL statement_timeout = '30min'");
    const locked = await trx('reading_imports').where({ id: importId }).forUpdate().first<{ status: string; rows: number; matched: number }>();
    if (locked.status === 'done') return { imported: locked.rows, matched: locked.matched };
    const { rows } = await trx.raw<{ rows: Array<{ imported: string; matched: string }> }>(
      `WITH moved AS (
         INSERT INTO readings (taken_at, geom, tech, channel, pci, rsrp_dbm, rsrq_db, sinr_db, rssi_dbm, cell_id, device, source, antenna_gain_dbi, height_m, import_id)
         SELECT taken_at, ST_SetSRID(ST_MakePoint(lon, lat), 4326), tech, channel, pci, rsrp_dbm, rsrq_db, sinr_db, rssi_dbm, cell_id, device, 'import', antenna_gain_dbi, height_m, import_id
           FROM reading_import_rows WHERE import_id = ? ORDER BY line
         RETURNING cell_id)
       SELECT count(*) AS imported, count(cell_id) AS matched FROM moved`,
      [importId],
    );
    const imported = Number(rows[0]!.imported);
    const matched = Number(rows[0]!.matched);
    await trx('reading_imports').where({ id: importId }).update({ status: 'done', matched, finished_at: trx.fn.now() });
    await trx('reading_import_rows').where({ import_id: importId }).delete();
    await recordAudit(trx, {
      userId: imp.owner_id === null ? null : String(imp.owner_id),
      action: 'import',
      entity: 'readings',
      entityId: String(importId),
      after: { file: imp.file_name, sha256: imp.sha256, rows: imported, matched },
    });
    return { imported, matched };
  });
  return {
    counts: { rows: imp.rows, imported: outcome.imported, matched: outcome.matched },
    message: `Imported ${outcome.imported} readings (${outcome.matched} matched to cells)`,
  };
}

/** The job handler for the readings-import queue. */
export function readingsImportHandler(db: Knex, opts: RunImportOptions = {}) {
  return (data: Record<string, unknown>, ctx: JobContext) => runReadingsImport(db, String(data.importId), ctx, opts);
}
