// Request bodies read under a size limit: the declared Content-Length is checked first, then the
// bytes are counted while they stream in, so an oversized body is refused (413) before it is
// buffered or parsed, whoever sends it. See DEVELOPERS.md "Request bodies and uploads".
import { Readable } from 'node:stream';
import type { ReadableStream as NodeWebReadableStream } from 'node:stream/web';
import busboy from 'busboy';
import { AppError, ValidationError } from './errors';

/** JSON and form bodies of the API (every write that is not a file upload). */
export const JSON_BODY_MAX_BYTES = 1024 * 1024;

/** Room for multipart boundaries, part headers and small fields around the files. */
export const MULTIPART_OVERHEAD_BYTES = 64 * 1024;

/** "1 MB", "200 kB": sizes in messages. */
export function formatBytes(bytes: number): string {
  if (bytes >= 1024 * 1024) return `${Math.round((bytes / (1024 * 1024)) * 10) / 10} MB`;
  if (bytes >= 1024) return `${Math.round(bytes / 1024)} kB`;
  return `${bytes} bytes`;
}

export class PayloadTooLargeError extends AppError {
  constructor(message: string) {
    super('PAYLOAD_TOO_LARGE', message);
  }
}

const bodyTooLarge = (maxBytes: number) => new PayloadTooLargeError(`The request body is larger than ${formatBytes(maxBytes)}`);

/** Refuses at once when the declared Content-Length is over the limit (or not a number). */
export function assertContentLength(request: Request, maxBytes: number, tooLarge: () => AppError = () => bodyTooLarge(maxBytes)): void {
  const header = request.headers.get('content-length');
  if (header === null) return; // chunked: counted while streaming
  if (!/^\d+$/.test(header.trim())) throw new ValidationError('Content-Length is not a number');
  if (Number(header) > maxBytes) throw tooLarge();
}

/**
 * The request body as a stream that fails with 413 as soon as more than `maxBytes` have passed
 * (the declared Content-Length is checked before anything is read). Pipe it into a parser.
 */
export function limitedStream(request: Request, maxBytes: number, tooLarge: () => AppError = () => bodyTooLarge(maxBytes)): ReadableStream<Uint8Array> {
  assertContentLength(request, maxBytes, tooLarge);
  const source = request.body;
  if (!source) return new ReadableStream({ start: (c) => c.close() });
  const reader = source.getReader();
  let seen = 0;
  return new ReadableStream<Uint8Array>({
    async pull(controller) {
      let chunk: ReadableStreamReadResult<Uint8Array>;
      try {
        chunk = await reader.read();
      } catch {
        controller.error(new ValidationError('The request body was interrupted'));
        return;
      }
      if (chunk.done) {
        controller.close();
        return;
      }
      seen += chunk.value.byteLength;
      if (seen > maxBytes) {
        controller.error(tooLarge());
        await reader.cancel().catch(() => undefined);
        return;
      }
      controller.enqueue(chunk.value);
    },
    async cancel(reason) {
      await reader.cancel(reason).catch(() => undefined);
    },
  });
}

/** The whole body as bytes, at most `maxBytes` (413 beyond, without reading further). */
export async function readLimitedBytes(request: Request, maxBytes: number, tooLarge: () => AppError = () => bodyTooLarge(maxBytes)): Promise<Uint8Array> {
  const reader = limitedStream(request, maxBytes, tooLarge).getReader();
  const chunks: Uint8Array[] = [];
  let total = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    chunks.push(value);
    total += value.byteLength;
  }
  const out = new Uint8Array(total);
  let at = 0;
  for (const c of chunks) {
    out.set(c, at);
    at += c.byteLength;
  }
  return out;
}

/** The whole body as UTF-8 text, at most `maxBytes`; bytes that are not UTF-8 are a 400. */
export async function readLimitedText(request: Request, maxBytes: number, tooLarge?: () => AppError): Promise<string> {
  const bytes = await readLimitedBytes(request, maxBytes, tooLarge);
  try {
    return new TextDecoder('utf-8', { fatal: true }).decode(bytes);
  } catch {
    throw new ValidationError('The request body is not UTF-8 text');
  }
}

/** A JSON body of at most `maxBytes` (1 MB unless said), parsed only once it is all in. */
export async function readJsonBody(request: Request, maxBytes = JSON_BODY_MAX_BYTES): Promise<unknown> {
  const text = await readLimitedText(request, maxBytes);
  try {
    return JSON.parse(text);
  } catch {
    throw new ValidationError('The request body is not valid JSON');
  }
}

// --- multipart/form-data -------------------------------------------------------------------

export interface MultipartLimits {
  /** Largest single file. */
  maxFileBytes: number;
  /** How many files one request may carry (default 1; 0 refuses files). */
  maxFiles?: number;
  /** Whole body including framing (default maxFileBytes × maxFiles + MULTIPART_OVERHEAD_BYTES). */
  maxTotalBytes?: number;
  /** Text fields (default 20), each at most maxFieldBytes (default 64 kB). */
  maxFields?: number;
  maxFieldBytes?: number;
  /** Message of the 413 for a file over maxFileBytes (default names the limit). */
  fileTooLargeMessage?: string;
}

export interface MultipartFile {
  /** The form field name (e.g. "file"). */
  field: string;
  /** The client's file name without any folder part or control characters ("upload" when none). */
  fileName: string;
  /** As declared by the client: check the content too. */
  mimeType: string;
  /** The file's bytes. Errors with 413 when the file passes maxFileBytes. Consume it or ignore it. */
  stream: Readable;
}

export interface BufferedFile {
  field: string;
  fileName: string;
  mimeType: string;
  bytes: Uint8Array;
}

/** Strips folders and control characters from a client file name. */
export function cleanFileName(name: string | undefined): string {
  const base = (name ?? '').split(/[\\/]/).pop() ?? '';
  const clean = base
    // eslint-disable-next-line no-control-regex
    .replace(/[\u0000-\u001f\u007f]/g, '')
    .trim()
    .slice(0, 200);
  return clean || 'upload';
}

const unreadable = () => new ValidationError('The upload could not be read as multipart form data');

/**
 * Streams a multipart/form-data body through busboy under the given limits. `onFile` is called
 * for each file part with its stream (e.g. pipe it into papaparse or a COPY) and `fields`
 * holding the text fields that came before it; the promise resolves with the text fields and
 * what each `onFile` returned, or rejects with the first error (413 for any limit, 400 for a
 * broken body, or whatever `onFile` threw). On error the rest of the body is not read.
 */
export async function readMultipart<T>(
  request: Request,
  limits: MultipartLimits,
  onFile: (file: MultipartFile, fields: Record<string, string>) => Promise<T>,
): Promise<{ fields: Record<string, string>; files: T[] }> {
  const type = request.headers.get('content-type') ?? '';
  if (!type.toLowerCase().startsWith('multipart/form-data')) {
    throw new AppError('UNSUPPORTED_MEDIA_TYPE', 'Send the upload as multipart/form-data');
  }
  const maxFiles = limits.maxFiles ?? 1;
  const maxFields = limits.maxFields ?? 20;
  const maxFieldBytes = limits.maxFieldBytes ?? 64 * 1024;
  const maxTotal = limits.maxTotalBytes ?? limits.maxFileBytes * Math.max(1, maxFiles) + MULTIPART_OVERHEAD_BYTES;
  const fileTooLarge = () => new PayloadTooLargeError(limits.fileTooLargeMessage ?? `The file is larger than ${formatBytes(limits.maxFileBytes)}`);

  let parser: busboy.Busboy;
  try {
    parser = busboy({
      headers: { 'content-type': type },
      limits: { fileSize: limits.maxFileBytes, files: maxFiles, fields: maxFields, fieldSize: maxFieldBytes, parts: maxFiles + maxFields },
    });
  } catch {
    throw unreadable();
  }
  const body = limitedStream(request, maxTotal, () => (maxFiles === 1 ? fileTooLarge() : bodyTooLarge(maxTotal)));
  const source = Readable.fromWeb(body as unknown as NodeWebReadableStream<Uint8Array>);

  return new Promise((resolve, reject) => {
    const fields: Record<string, string> = {};
    const pending: Promise<T>[] = [];
    let settled = false;
    const fail = (err: unknown) => {
      if (settled) return;
      settled = true;
      source.unpipe(parser);
      source.destroy();
      parser.removeAllListeners('file');
      reject(err);
    };

    parser.on('field', (name, value, info) => {
      if (info.valueTruncated) fail(new PayloadTooLargeError(`The field "${name}" is longer than ${formatBytes(maxFieldBytes)}`));
      else fields[name] = value;
    });
    parser.on('file', (field, stream, info) => {
      stream.on('limit', () => {
        const err = fileTooLarge();
        stream.destroy(err);
        fail(err);
      });
      const file: MultipartFile = { field, fileName: cleanFileName(info.filename), mimeType: info.mimeType, stream };
      const result = Promise.resolve()
        .then(() => onFile(file, { ...fields }))
        // Whatever the handler left unread is drained so the parser can go on.
        .finally(() => stream.resume());
      result.catch(fail);
      pending.push(result);
    });
    parser.on('filesLimit', () =>
      fail(new PayloadTooLargeError(maxFiles === 0 ? 'This form takes no files' : `At most ${maxFiles} file${maxFiles === 1 ? '' : 's'} in one upload`)),
    );
    parser.on('fieldsLimit', () => fail(new PayloadTooLargeError(`At most ${maxFields} form fields`)));
    parser.on('partsLimit', () => fail(new PayloadTooLargeError('The form has too many parts')));
    parser.on('error', () => fail(unreadable()));
    source.on('error', (err) => fail(err instanceof AppError ? err : unreadable()));
    parser.on('close', () => {
      Promise.all(pending).then((files) => {
        if (settled) return;
        settled = true;
        resolve({ fields, files });
      }, fail);
    });
    source.pipe(parser);
  });
}

/** Reads a file stream into memory (it is already limited by readMultipart). */
export async function streamToBytes(stream: Readable): Promise<Uint8Array> {
  const chunks: Buffer[] = [];
  for await (const chunk of stream) chunks.push(chunk as Buffer);
  return new Uint8Array(Buffer.concat(chunks));
}

/** readMultipart for small uploads that are parsed whole: every file buffered, each ≤ maxFileBytes. */
export async function readMultipartFiles(request: Request, limits: MultipartLimits): Promise<{ fields: Record<string, string>; files: BufferedFile[] }> {
  return readMultipart(request, limits, async (file) => ({
    field: file.field,
    fileName: file.fileName,
    mimeType: file.mimeType,
    bytes: await streamToBytes(file.stream),
  }));
}
