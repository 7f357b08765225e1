// A CSV upload as a stream: multipart field `file` (busboy, through readMultipart) or a bare
// text/csv body, refused with 413 as soon as it passes the limit and with 415 when it is not
// text. The consumer reads the stream as it arrives (papaparse → COPY), so nothing is held whole.
import { Readable } from 'node:stream';
import type { ReadableStream as NodeWebReadableStream } from 'node:stream/web';
import { AppError, ValidationError } from './errors';
import { formatBytes, limitedStream, MULTIPART_OVERHEAD_BYTES, PayloadTooLargeError, readMultipart } from './request-body';

const CSV_TYPES = ['text/csv', 'application/csv', 'text/plain', 'application/vnd.ms-excel', 'application/octet-stream', ''];

export interface CsvUploadOptions {
  maxBytes: number;
  /** Named in the 415 message, e.g. "columns label, postcode, lat, lon". */
  describe: string;
}

/** No CSV line of ours comes near this; a longer one would have to be buffered whole to parse. */
export const CSV_MAX_LINE_BYTES = 1024 * 1024;

/**
 * The same bytes, failing with 415 when the first ones hold a NUL (a spreadsheet, an image, a
 * zip) and with 413 when a line runs past CSV_MAX_LINE_BYTES. Lazy: nothing is read until the
 * consumer reads, so no error can fire unheard.
 */
function sniffText(source: Readable, notCsv: () => AppError): Readable {
  // The upload may fail (413) before the consumer starts reading; the iterator below reports it then.
  source.on('error', () => undefined);
  return Readable.from(
    (async function* () {
      let checked = 0;
      let sinceNewline = 0;
      for await (const chunk of source as AsyncIterable<Buffer>) {
        if (checked < 4096) {
          const head = chunk.subarray(0, 4096 - checked);
          checked += head.byteLength;
          if (head.includes(0)) throw notCsv();
        }
        const last = chunk.lastIndexOf(10);
        sinceNewline = last === -1 ? sinceNewline + chunk.byteLength : chunk.byteLength - last - 1;
        if (sinceNewline > CSV_MAX_LINE_BYTES) throw new PayloadTooLargeError(`A line of the file is longer than ${formatBytes(CSV_MAX_LINE_BYTES)}`);
        yield chunk;
      }
    })(),
    { objectMode: false },
  );
}

/**
 * Hands the uploaded CSV to `consume` as a byte stream and returns what it returns. Errors thrown
 * by the stream (413, 415) or by `consume` reject the call; the rest of the body is not read.
 */
export async function withCsvUpload<T>(
  request: Request,
  opts: CsvUploadOptions,
  consume: (stream: Readable, fileName: string | null) => Promise<T>,
): Promise<T> {
  const notCsv = () => new AppError('UNSUPPORTED_MEDIA_TYPE', `Send a CSV file (${opts.describe})`);
  const tooLarge = () => new PayloadTooLargeError(`The file is larger than ${formatBytes(opts.maxBytes)}; split it and import the parts`);
  const type = (request.headers.get('content-type') ?? '').toLowerCase();
  if (type.startsWith('multipart/form-data')) {
    const { files } = await readMultipart(
      request,
      { maxFileBytes: opts.maxBytes, maxTotalBytes: opts.maxBytes + MULTIPART_OVERHEAD_BYTES, fileTooLargeMessage: tooLarge().message },
      async (file) => {
        if (file.field !== 'file') return { skipped: true as const };
        const typeOk = CSV_TYPES.includes(file.mimeType.toLowerCase().split(';')[0]!.trim());
        const nameOk = !/\.[a-z0-9]+$/i.test(file.fileName) || /\.(csv|txt)$/i.test(file.fileName);
        if (!typeOk || !nameOk) throw notCsv();
        const fileName = file.fileName === 'upload' ? null : file.fileName;
        return { skipped: false as const, value: await consume(sniffText(file.stream, notCsv), fileName) };
      },
    );
    const used = files.find((f) => !f.skipped);
    if (!used || used.skipped) throw new ValidationError('Choose a CSV file', { file: ['Choose a CSV file'] });
    return used.value;
  }
  if (type.startsWith('text/csv') || type.startsWith('application/csv')) {
    const body = Readable.fromWeb(limitedStream(request, opts.maxBytes, tooLarge) as unknown as NodeWebReadableStream<Uint8Array>);
    return consume(sniffText(body, notCsv), null);
  }
  throw notCsv();
}
