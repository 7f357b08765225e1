// Streams one layer as a file: the rows come from a database cursor (Knex .stream(), which reads
// them a hundred at a time) inside a read-only transaction, go through the format's writer a batch
// at a time, and leave as the response body with backpressure, so memory stays flat however large
// the layer. A file holds at most `maxRows` rows; more is refused before anything is sent, or paged
// with `limit` and `after`.
import { Readable, Transform, pipeline } from 'node:stream';
import type { Knex } from 'knex';
import { AppError, NotFoundError, ValidationError } from './errors';
import { getExportLayer, type ExportRow, type ExportViewer } from './repos/export-layers';
import { createExportWriter } from './export-writers';
import { EXPORT_CONTENT_TYPES, EXPORT_LAYER_LABELS, type ExportFormat, type ExportLayer, type ExportQuery } from '../schemas/exports';

/** Rows handed to the writer at once. */
const BATCH_ROWS = 500;

export interface ExportRequest {
  layer: ExportLayer;
  format: ExportFormat;
  query: ExportQuery;
  viewer: ExportViewer;
  /** Most rows one file may hold. */
  maxRows: number;
  now: Date;
}

export interface ExportFile {
  body: ReadableStream<Uint8Array>;
  headers: Record<string, string>;
}

export function getExportFileName(layer: ExportLayer, format: ExportFormat, query: ExportQuery, now: Date): string {
  const parts = ['bearline', layer];
  if (query.regionId) parts.push(`region-${query.regionId}`);
  if (query.afterId) parts.push(`after-${query.afterId}`);
  parts.push(now.toISOString().slice(0, 10).replace(/-/g, ''));
  return `${parts.join('-')}.${format}`;
}

async function findRegionBbox(db: Knex, id: string): Promise<[number, number, number, number]> {
  const row = await db('regions').where({ id }).first(db.raw('ST_XMin(geom) AS w, ST_YMin(geom) AS s, ST_XMax(geom) AS e, ST_YMax(geom) AS n'));
  if (!row) throw new NotFoundError('Region not found');
  return [row.w, row.s, row.e, row.n];
}

async function countUpTo(trx: Knex.Transaction, page: Knex.QueryBuilder | Knex.Raw): Promise<number> {
  const { rows } = await trx.raw<{ rows: { n: number }[] }>('SELECT count(*)::int AS n FROM (?) t', [page]);
  return rows[0]?.n ?? 0;
}

export async function exportLayer(db: Knex, req: ExportRequest): Promise<ExportFile> {
  const { layer, format, query, maxRows } = req;
  if (query.limit !== undefined && query.limit > maxRows) {
    throw new ValidationError('Some fields need attention', { limit: [`At most ${maxRows} rows per file`] });
  }
  const region = query.regionId ? await findRegionBbox(db, query.regionId) : null;
  const trx = await db.transaction({ readOnly: true, isolationLevel: 'repeatable read' });
  try {
    // A large file can take minutes to download; the cursor stays open that long.
    await trx.raw("SET LOCAL statement_timeout = '30min'");
    const spec = getExportLayer(trx, layer, query, req.viewer, region);
    const size = query.limit ?? maxRows;
    const matching = await countUpTo(trx, spec.page(size + 1, query.afterId));
    const headers: Record<string, string> = {
      'Content-Type': EXPORT_CONTENT_TYPES[format],
      'Content-Disposition': `attachment; filename="${getExportFileName(layer, format, query, req.now)}"`,
      'Cache-Control': 'no-store',
      'X-Export-Rows': String(Math.min(matching, size)),
    };
    if (matching > size) {
      if (query.limit === undefined) {
        throw new AppError(
          'UNPROCESSABLE_CONTENT',
          `More than ${maxRows} ${EXPORT_LAYER_LABELS[layer].toLowerCase()} match: narrow the filter (bbox, region, operator, band, technology, status)` +
            (spec.pageable ? ' or fetch the file in pages with limit= and after= (the last id of the previous page).' : '.'),
          { limit: [`At most ${maxRows} rows per file`] },
        );
      }
      const { rows } = await trx.raw<{ rows: { id: string }[] }>('SELECT t.id FROM (?) t ORDER BY t.id OFFSET ? LIMIT 1', [
        spec.page(size, query.afterId),
        size - 1,
      ]);
      if (rows[0]) headers['X-Next-After'] = String(rows[0].id);
    }

    const writer = createExportWriter(format, spec, `Bearline ${EXPORT_LAYER_LABELS[layer].toLowerCase()}`);
    let batch: ExportRow[] = [];
    const encode = new Transform({
      writableObjectMode: true,
      transform(row: ExportRow, _enc, done) {
        batch.push(spec.toRow(row));
        if (batch.length < BATCH_ROWS) return done();
        const text = writer.rows(batch);
        batch = [];
        done(null, text);
      },
      flush(done) {
        try {
          done(null, (batch.length ? writer.rows(batch) : '') + writer.tail());
        } catch (err) {
          done(err as Error);
        }
      },
    });
    encode.push(writer.head());
    const cursor = spec.page(size, query.afterId).stream();
    pipeline(cursor, encode, (err) => {
      if (err) {
        if ((err as NodeJS.ErrnoException).code !== 'ERR_STREAM_PREMATURE_CLOSE') console.error('[bearline] export stopped', err.message);
        void trx.rollback().catch(() => undefined);
      } else {
        void trx.commit().catch(() => undefined);
      }
    });
    return { body: Readable.toWeb(encode) as unknown as ReadableStream<Uint8Array>, headers };
  } catch (err) {
    await trx.rollback().catch(() => undefined);
    throw err;
  }
}
