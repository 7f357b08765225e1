// Body limits are enforced while the body streams in: an endless body is cut off just past the
// limit, never buffered whole, and the answer is a 413 in the error shape.
import { describe, expect, it } from 'vitest';
import {
  JSON_BODY_MAX_BYTES,
  limitedStream,
  readJsonBody,
  readLimitedBytes,
  readMultipart,
  readMultipartFiles,
  streamToBytes,
} from '../../src/lib/server/request-body';
import { parseBody, readBody } from '../../src/lib/server/http';
import { AppError } from '../../src/lib/server/errors';
import { z } from 'zod';

const CHUNK = 64 * 1024;

/** A body that would go on for `totalBytes`, counting how much of it was read. */
function endlessBody(totalBytes: number, fill = 0x61) {
  const counter = { pulled: 0 };
  const stream = new ReadableStream<Uint8Array>({
    pull(controller) {
      if (counter.pulled >= totalBytes) return controller.close();
      counter.pulled += CHUNK;
      controller.enqueue(new Uint8Array(CHUNK).fill(fill));
    },
  });
  return { stream, counter };
}

function streamedRequest(body: ReadableStream<Uint8Array>, headers: Record<string, string>): Request {
  return new Request('http://127.0.0.1/api/test', { method: 'POST', body, headers, duplex: 'half' } as RequestInit);
}

async function rejection(p: Promise<unknown>): Promise<AppError> {
  try {
    await p;
  } catch (err) {
    if (err instanceof AppError) return err;
    throw err;
  }
  throw new Error('expected a rejection');
}

describe('JSON and form bodies (shared parseBody)', () => {
  it('refuses a declared Content-Length over 1 MB before reading a byte', async () => {
    const { stream, counter } = endlessBody(400 * 1024 * 1024);
    const req = streamedRequest(stream, { 'content-type': 'application/json', 'content-length': String(400 * 1024 * 1024) });
    const err = await rejection(readBody(req));
    expect(err.code).toBe('PAYLOAD_TOO_LARGE');
    expect(counter.pulled).toBeLessThanOrEqual(CHUNK); // at most what the stream pre-fetched
  });

  it('cuts a chunked JSON body off just past 1 MB, not after reading all 400 MB', async () => {
    const { stream, counter } = endlessBody(400 * 1024 * 1024);
    const err = await rejection(readBody(streamedRequest(stream, { 'content-type': 'application/json' })));
    expect(err.code).toBe('PAYLOAD_TOO_LARGE');
    expect(err.message).toBe('The request body is larger than 1 MB');
    expect(counter.pulled).toBeLessThan(JSON_BODY_MAX_BYTES + 4 * CHUNK);
  });

  it('cuts url-encoded and multipart forms off the same way', async () => {
    const form = endlessBody(50 * 1024 * 1024);
    const err = await rejection(readBody(streamedRequest(form.stream, { 'content-type': 'application/x-www-form-urlencoded' })));
    expect(err.code).toBe('PAYLOAD_TOO_LARGE');
    expect(form.counter.pulled).toBeLessThan(JSON_BODY_MAX_BYTES + 4 * CHUNK);

    const multi = endlessBody(50 * 1024 * 1024);
    const errMulti = await rejection(readBody(streamedRequest(multi.stream, { 'content-type': 'multipart/form-data; boundary=xyz' })));
    expect(['PAYLOAD_TOO_LARGE', 'BAD_REQUEST']).toContain(errMulti.code);
    expect(multi.counter.pulled).toBeLessThan(JSON_BODY_MAX_BYTES + 4 * CHUNK);
  });

  it('accepts a body at the limit and lets a route raise its own limit', async () => {
    const name = 'x'.repeat(JSON_BODY_MAX_BYTES - 20);
    const body = JSON.stringify({ name });
    expect(body.length).toBeLessThanOrEqual(JSON_BODY_MAX_BYTES);
    const schema = z.object({ name: z.string() });
    const ok = await parseBody(schema, new Request('http://x/', { method: 'POST', body, headers: { 'content-type': 'application/json' } }));
    expect(ok.name.length).toBe(name.length);

    const bigger = JSON.stringify({ name: 'y'.repeat(2 * JSON_BODY_MAX_BYTES) });
    const refused = await rejection(
      parseBody(schema, new Request('http://x/', { method: 'POST', body: bigger, headers: { 'content-type': 'application/json' } })),
    );
    expect(refused.code).toBe('PAYLOAD_TOO_LARGE');
    const raised = await parseBody(schema, new Request('http://x/', { method: 'POST', body: bigger, headers: { 'content-type': 'application/json' } }), {
      maxBytes: 3 * JSON_BODY_MAX_BYTES,
    });
    expect(raised.name.length).toBe(2 * JSON_BODY_MAX_BYTES);
  });

  it('answers 400 for broken JSON, a non-object, or a Content-Length that is not a number', async () => {
    const post = (body: string, headers: Record<string, string> = {}) =>
      new Request('http://x/', { method: 'POST', body, headers: { 'content-type': 'application/json', ...headers } });
    expect((await rejection(readBody(post('{"a":')))).code).toBe('BAD_REQUEST');
    expect((await rejection(readBody(post('[1,2]')))).message).toBe('The request body is not a JSON object');
    expect((await rejection(readJsonBody(post('\u00ff'.repeat(3))))).code).toBe('BAD_REQUEST');
    const bogus = new Request('http://x/', { method: 'POST', body: '{}', headers: { 'content-type': 'application/json', 'content-length': '1e9' } });
    expect((await rejection(readBody(bogus))).code).toBe('BAD_REQUEST');
  });
});

describe('limitedStream / readLimitedBytes for raw uploads', () => {
  it('passes a body under the limit through unchanged', async () => {
    const bytes = new TextEncoder().encode('label,postcode,lat,lon\n');
    const req = new Request('http://x/', { method: 'POST', body: bytes });
    expect(new TextDecoder().decode(await readLimitedBytes(req, 1024))).toBe('label,postcode,lat,lon\n');
  });

  it("errors the stream with a 413 once the limit is passed, with the route's own message", async () => {
    const { stream, counter } = endlessBody(100 * 1024 * 1024);
    const limited = limitedStream(streamedRequest(stream, {}), 256 * 1024, () => new AppError('PAYLOAD_TOO_LARGE', 'Split the file'));
    const reader = limited.getReader();
    const err = await rejection(
      (async () => {
        for (;;) if ((await reader.read()).done) break;
      })(),
    );
    expect(err.message).toBe('Split the file');
    expect(counter.pulled).toBeLessThan(256 * 1024 + 4 * CHUNK);
  });
});

/** A multipart body built by hand (boundary "b0undary"). */
function multipart(parts: { name: string; fileName?: string; type?: string; content: string }[]): Blob {
  const chunks: string[] = [];
  for (const p of parts) {
    const disposition = `form-data; name="${p.name}"${p.fileName !== undefined ? `; filename="${p.fileName}"` : ''}`;
    const head = `--b0undary\r\nContent-Disposition: ${disposition}\r\n${p.type ? `Content-Type: ${p.type}\r\n` : ''}\r\n`;
    chunks.push(head, p.content, '\r\n');
  }
  chunks.push('--b0undary--\r\n');
  return new Blob(chunks);
}
const MULTIPART = { 'content-type': 'multipart/form-data; boundary=b0undary' };

describe('readMultipart (busboy) for file uploads', () => {
  it('hands each file over as a stream with the fields sent before it', async () => {
    const body = multipart([
      { name: 'note', content: 'first' },
      { name: 'file', fileName: '..\\dir/readings.csv', type: 'text/csv', content: 'a,b\n1,2\n' },
    ]);
    const seen: string[] = [];
    const result = await readMultipart(new Request('http://x/', { method: 'POST', body, headers: MULTIPART }), { maxFileBytes: 1024 }, async (file, fields) => {
      seen.push(`${file.field}:${file.fileName}:${file.mimeType}:${fields.note}`);
      return new TextDecoder().decode(await streamToBytes(file.stream));
    });
    expect(seen).toEqual(['file:readings.csv:text/csv:first']);
    expect(result.files).toEqual(['a,b\n1,2\n']);
    expect(result.fields).toEqual({ note: 'first' });
  });

  it('refuses a file over its limit with 413 while it streams (chunked, no Content-Length)', async () => {
    const { stream, counter } = endlessBody(200 * 1024 * 1024);
    const head = new TextEncoder().encode('--b0undary\r\nContent-Disposition: form-data; name="file"; filename="big.csv"\r\n\r\n');
    let sentHead = false;
    const reader = stream.getReader();
    const body = new ReadableStream<Uint8Array>({
      async pull(c) {
        if (!sentHead) {
          sentHead = true;
          return c.enqueue(head);
        }
        const r = await reader.read();
        if (r.done) c.close();
        else c.enqueue(r.value);
      },
    });
    const err = await rejection(
      readMultipartFiles(streamedRequest(body, MULTIPART), { maxFileBytes: 1024 * 1024, fileTooLargeMessage: 'The file is larger than 1 MB; split it' }),
    );
    expect(err.code).toBe('PAYLOAD_TOO_LARGE');
    expect(err.message).toBe('The file is larger than 1 MB; split it');
    expect(counter.pulled).toBeLessThan(1024 * 1024 + MULTIPART_SLACK);
  });

  it('refuses more files than allowed, oversized fields, and files where none are taken', async () => {
    const two = multipart([
      { name: 'file', fileName: 'a.jpg', type: 'image/jpeg', content: 'x' },
      { name: 'file', fileName: 'b.jpg', type: 'image/jpeg', content: 'y' },
    ]);
    const tooMany = await rejection(readMultipartFiles(new Request('http://x/', { method: 'POST', body: two, headers: MULTIPART }), { maxFileBytes: 100 }));
    expect(tooMany.code).toBe('PAYLOAD_TOO_LARGE');
    expect(tooMany.message).toBe('At most 1 file in one upload');

    const both = await readMultipartFiles(new Request('http://x/', { method: 'POST', body: two, headers: MULTIPART }), { maxFileBytes: 100, maxFiles: 2 });
    expect(both.files.map((f) => f.fileName)).toEqual(['a.jpg', 'b.jpg']);

    const longField = multipart([{ name: 'note', content: 'z'.repeat(5000) }]);
    const field = await rejection(
      readMultipartFiles(new Request('http://x/', { method: 'POST', body: longField, headers: MULTIPART }), { maxFileBytes: 100, maxFieldBytes: 1000 }),
    );
    expect(field.code).toBe('PAYLOAD_TOO_LARGE');

    const formWithFile = await rejection(readBody(new Request('http://x/', { method: 'POST', body: two, headers: MULTIPART })));
    expect(formWithFile.message).toBe('This form takes no files');
  });

  it('answers 400 for a broken multipart body and 415 for another type', async () => {
    const broken = await rejection(
      readMultipartFiles(new Request('http://x/', { method: 'POST', body: '--b0undary\r\nContent-Disp', headers: MULTIPART }), { maxFileBytes: 100 }),
    );
    expect(broken.code).toBe('BAD_REQUEST');
    const noBoundary = await rejection(
      readMultipartFiles(new Request('http://x/', { method: 'POST', body: 'x', headers: { 'content-type': 'multipart/form-data' } }), { maxFileBytes: 100 }),
    );
    expect(noBoundary.code).toBe('BAD_REQUEST');
    const other = await rejection(
      readMultipartFiles(new Request('http://x/', { method: 'POST', body: 'x', headers: { 'content-type': 'text/plain' } }), { maxFileBytes: 100 }),
    );
    expect(other.code).toBe('UNSUPPORTED_MEDIA_TYPE');
  });

  it('stops reading when the file handler fails, and reports its error', async () => {
    const body = multipart([{ name: 'file', fileName: 'r.csv', content: 'bad' }]);
    const err = await rejection(
      readMultipart(new Request('http://x/', { method: 'POST', body, headers: MULTIPART }), { maxFileBytes: 100 }, async () => {
        throw new AppError('UNPROCESSABLE_CONTENT', 'Row 1 is wrong');
      }),
    );
    expect(err.message).toBe('Row 1 is wrong');
  });
});

// busboy reads ahead a little before it notices the limit.
const MULTIPART_SLACK = 4 * CHUNK;
