// Gazetteer import from a CSV stream: papaparse → checks → COPY into a temporary staging table →
// one INSERT … SELECT (an address known by the same label and postcode is moved, not duplicated).
// All or nothing: the caller's transaction rolls back on any bad row. No astro:env here, so
// scripts and benchmarks can call it with their own Knex.
import type { Knex } from 'knex';
import type { Readable } from 'node:stream';
import { AddressRowSchema } from '../schemas/addresses';
import { allowLongStatements, connectionOf, copyCsvIntoTable, MAX_LISTED_ROW_ERRORS, type RowCheck } from './csv-copy';
import { AppError, ValidationError } from './errors';
import { recordAudit } from './repos/audit';
import type { ImportSummary } from './repos/addresses';
import { rowErrorFields, rowProblemsError } from './import-report';
import { hashingStream } from './hashing-stream';

const REQUIRED_COLUMNS = ['label', 'lat', 'lon'] as const;
export const ADDRESS_CSV_COLUMNS = ['label', 'postcode', 'lat', 'lon'] as const;

function checkHeader(header: string[]): string[] {
  const missing = REQUIRED_COLUMNS.filter((c) => !header.includes(c));
  return missing.length ? [`Missing column${missing.length > 1 ? 's' : ''}: ${missing.join(', ')} (expected ${ADDRESS_CSV_COLUMNS.join(', ')})`] : [];
}

function checkRow(record: Record<string, string>, line: number): RowCheck {
  const parsed = AddressRowSchema.safeParse({ label: record.label ?? '', postcode: record.postcode ?? '', lat: record.lat ?? '', lon: record.lon ?? '' });
  if (!parsed.success) return { ok: false, messages: parsed.error.issues.map((i) => i.message) };
  const r = parsed.data;
  return { ok: true, values: [line, r.label, r.postcode, r.lon, r.lat] };
}

export interface AddressImportMeta {
  fileName: string | null;
  actorId: string | null;
  source?: string;
}

/**
 * Streams the CSV into the gazetteer inside `trx`. Throws 422 (with `fields` "line N" → reasons)
 * when the file or any row is bad; the caller's transaction then leaves the gazetteer as it was.
 */
export async function importAddressCsv(trx: Knex.Transaction, input: Readable, meta: AddressImportMeta): Promise<ImportSummary> {
  // A large file takes longer than the default statement timeout.
  await allowLongStatements(trx, 30);
  await trx.raw(
    `CREATE TEMP TABLE address_import_rows (line int NOT NULL, label text NOT NULL, postcode text, lon float8 NOT NULL, lat float8 NOT NULL) ON COMMIT DROP`,
  );
  const hashed = hashingStream(input);
  const copied = await copyCsvIntoTable(await connectionOf(trx), hashed.stream, {
    table: 'address_import_rows',
    columns: ['line', 'label', 'postcode', 'lon', 'lat'],
    checkHeader,
    checkRow,
  });
  if (hashed.bytes() === 0) throw new ValidationError('The file is empty', { file: ['The file is empty'] });
  if (copied.fileErrors.length) throw new AppError('UNPROCESSABLE_CONTENT', copied.fileErrors[0]!, { file: copied.fileErrors });
  if (copied.errorCount) throw rowProblemsError(copied.errorCount, copied.errors);

  // The same label and postcode twice in one file: name the later lines.
  const { rows: dupes } = await trx.raw<{ rows: Array<{ line: number; first_line: number }> }>(
    `SELECT line, first_line FROM (
       SELECT line, min(line) OVER (PARTITION BY lower(label) || '|' || coalesce(upper(replace(postcode, ' ', '')), '')) AS first_line
         FROM address_import_rows) d
      WHERE line <> first_line ORDER BY line LIMIT ${MAX_LISTED_ROW_ERRORS + 1}`,
  );
  if (dupes.length) {
    const errors = dupes.map((d) => ({ line: d.line, messages: [`same label and postcode as line ${d.first_line}`] }));
    throw new AppError('UNPROCESSABLE_CONTENT', rowProblemsError(errors.length, errors).message, rowErrorFields(errors));
  }

  const { rows } = await trx.raw<{ rows: Array<{ inserted: string; total: string }> }>(
    `WITH moved AS (
       INSERT INTO addresses (label, postcode, geom, source)
       SELECT label, postcode, ST_SetSRID(ST_MakePoint(lon, lat), 4326), ? FROM address_import_rows ORDER BY line
       ON CONFLICT (match_key) DO UPDATE
         SET label = EXCLUDED.label, postcode = EXCLUDED.postcode, geom = EXCLUDED.geom, source = EXCLUDED.source, updated_at = now()
         WHERE addresses.label IS DISTINCT FROM EXCLUDED.label
            OR addresses.postcode IS DISTINCT FROM EXCLUDED.postcode
            OR NOT ST_Equals(addresses.geom, EXCLUDED.geom)
       RETURNING (xmax = 0) AS inserted)
     SELECT count(*) FILTER (WHERE inserted) AS inserted, count(*) AS total FROM moved`,
    [meta.source ?? 'import'],
  );
  const inserted = Number(rows[0]?.inserted ?? 0);
  const written = Number(rows[0]?.total ?? 0);
  // A known address the file repeats exactly is left alone (no row comes back for it).
  const summary: ImportSummary = { rows: copied.rows, inserted, updated: written - inserted, unchanged: copied.rows - written };
  await recordAudit(trx, {
    userId: meta.actorId,
    action: 'import',
    entity: 'addresses',
    entityId: null,
    after: { file: meta.fileName, sha256: hashed.sha256(), bytes: hashed.bytes(), ...summary },
  });
  return summary;
}
