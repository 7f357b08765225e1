// CSV upload → papaparse (streaming) → row checks → COPY into a staging table (pg-copy-streams),
// never holding the whole file: rows flow through with backpressure, so memory stays flat however
// large the upload. Used by the gazetteer and the readings imports; runs outside Vite too (scripts,
// benchmarks), so it takes a pg connection rather than reading the app's config.
import type { Knex } from 'knex';
import { once } from 'node:events';
import type { Readable } from 'node:stream';
import Papa from 'papaparse';
import type { PoolClient } from 'pg';
import { from as copyFrom } from 'pg-copy-streams';

/** Beyond this many bad rows the report stops listing them (the count stays exact). */
export const MAX_LISTED_ROW_ERRORS = 200;

export interface RowError {
  line: number;
  messages: string[];
}

export type RowCheck = { ok: true; values: readonly CopyValue[] } | { ok: false; messages: string[] };
export type CopyValue = string | number | boolean | null;

export interface CsvCopyOptions {
  /** Staging table and its columns, in the order checkRow returns values. */
  table: string;
  columns: readonly string[];
  /** Problems with the header as a whole (missing columns); empty when it is usable. */
  checkHeader: (header: string[]) => string[];
  /** One record by column name (lower-cased header) → the values to COPY, or what is wrong. */
  checkRow: (record: Record<string, string>, line: number) => RowCheck;
  /** Called every few thousand rows with the rows read so far. */
  onRows?: (rows: number) => void;
}

export interface CsvCopyResult {
  /** Good rows written to the staging table (0 when any row was bad: nothing is kept then). */
  rows: number;
  /** Rows read, good and bad. */
  rowsRead: number;
  errors: RowError[];
  errorCount: number;
  /** Problems with the file as a whole (empty, no header, missing columns). */
  fileErrors: string[];
}

/** COPY text format (PostgreSQL docs, COPY "Text Format"): backslash escapes, \N for null. */
export function copyTextField(value: CopyValue): string {
  if (value === null) return '\\N';
  const s = String(value);
  return /[\\\t\n\r]/.test(s) ? s.replace(/\\/g, '\\\\').replace(/\t/g, '\\t').replace(/\n/g, '\\n').replace(/\r/g, '\\r') : s;
}

const countNewlines = (fields: string[]) => fields.reduce((n, f) => (f.includes('\n') ? n + f.split('\n').length - 1 : n), 0);

/**
 * Streams a CSV into `table` over `conn` (inside the caller's transaction). Line numbers count
 * physical lines from 1 (the header); a quoted value spanning lines is reported where it starts.
 * Once a row is bad, later rows are still checked (to report them) but no longer written; the
 * caller rolls the transaction back.
 */
export async function copyCsvIntoTable(conn: PoolClient, input: Readable, opts: CsvCopyOptions): Promise<CsvCopyResult> {
  const result: CsvCopyResult = { rows: 0, rowsRead: 0, errors: [], errorCount: 0, fileErrors: [] };
  const copy = conn.query(copyFrom(`COPY ${opts.table} (${opts.columns.join(', ')}) FROM STDIN`));
  const copyDone = new Promise<void>((resolve, reject) => {
    copy.on('finish', resolve);
    copy.on('error', reject);
  });
  // A COPY error (e.g. the connection went away) must not surface as an unhandled rejection.
  copyDone.catch(() => undefined);

  input.setEncoding('utf8');
  const parser = Papa.parse(Papa.NODE_STREAM_INPUT, { skipEmptyLines: false }) as unknown as NodeJS.ReadWriteStream;
  input.on('error', (err) => (parser as unknown as Readable).destroy(err));
  input.pipe(parser);

  let header: string[] | null = null;
  let line = 1;
  let buffer = '';
  const flush = async () => {
    if (!buffer) return;
    const chunk = buffer;
    buffer = '';
    if (!copy.write(chunk)) await once(copy, 'drain');
  };

  try {
    await readRows();
  } catch (err) {
    // CopyFail to the server, so the connection leaves COPY mode and the caller can roll back.
    copy.destroy(err instanceof Error ? err : new Error(String(err)));
    await copyDone.catch(() => undefined);
    throw err;
  }
  copy.end();
  await copyDone;

  if (!header) result.fileErrors.push('The file is empty; the first line must name the columns');
  else if (!result.fileErrors.length && result.rowsRead === 0) result.fileErrors.push('The file has a header but no rows');
  if (result.errorCount > 0) result.rows = 0;
  return result;

  async function readRows() {
    for await (const fields of parser as AsyncIterable<string[]>) {
      const startLine = line;
      line += 1 + countNewlines(fields);
      if (!header) {
        header = fields.map((h, i) => (i === 0 ? h.replace(/^\uFEFF/, '') : h).trim().toLowerCase());
        result.fileErrors.push(...opts.checkHeader(header));
        if (result.fileErrors.length) break;
        continue;
      }
      if (fields.length === 1 && fields[0]!.trim() === '') continue; // blank line
      result.rowsRead += 1;
      let check: RowCheck;
      if (fields.length !== header.length) {
        check = { ok: false, messages: [`expected ${header.length} values, found ${fields.length}`] };
      } else if (fields.some((f) => f.includes('\uFFFD') || f.includes('\u0000'))) {
        check = { ok: false, messages: ['the line is not UTF-8 text'] };
      } else {
        const record: Record<string, string> = {};
        for (let i = 0; i < header.length; i++) record[header[i]!] = fields[i]!;
        check = opts.checkRow(record, startLine);
      }
      if (!check.ok) {
        result.errorCount += 1;
        if (result.errors.length < MAX_LISTED_ROW_ERRORS) result.errors.push({ line: startLine, messages: check.messages });
      } else if (result.errorCount === 0) {
        buffer += check.values.map(copyTextField).join('\t') + '\n';
        result.rows += 1;
        if (buffer.length >= 64 * 1024) await flush();
      }
      if (opts.onRows && result.rowsRead % 5000 === 0) opts.onRows(result.rowsRead);
    }
    if (!result.fileErrors.length) await flush();
  }
}

/** The raw pg connection of a Knex transaction (for COPY, which Knex does not speak). */
export async function connectionOf(trx: { client: { acquireConnection(): Promise<unknown> } }): Promise<PoolClient> {
  return (await trx.client.acquireConnection()) as PoolClient;
}

/**
 * Lets the statements of `trx` run for up to `minutes` (a large import's COPY and INSERT … SELECT):
 * the server's statement_timeout for this transaction (SET LOCAL), and the client's own read
 * timeout on its connection (db.ts gives up a few seconds after the server's default, which would
 * otherwise cut a long COPY short), put back when the transaction ends.
 */
export async function allowLongStatements(trx: Knex.Transaction, minutes: number): Promise<void> {
  await trx.raw(`SET LOCAL statement_timeout = '${Math.round(minutes)}min'`);
  const params = (await connectionOf(trx)) as unknown as { connectionParameters?: { query_timeout?: number } };
  const settings = params.connectionParameters;
  if (!settings) return;
  const before = settings.query_timeout;
  settings.query_timeout = minutes * 60_000 + 5_000;
  const restore = () => {
    settings.query_timeout = before;
  };
  trx.executionPromise.then(restore, restore);
}
