// Against the running app (scripts/test.ts starts it): what the HTTP edge does before any
// handler logic runs — body limits while streaming, anonymous or not.
import { describe, expect, it } from 'vitest';
import { request as httpRequest } from 'node:http';
import { APP_URL, appFetch, signInCookie } from '../helpers/app';

interface RawAnswer {
  status: number;
  headers: Record<string, string | string[] | undefined>;
  body: string;
  /** Bytes the client had written when the answer came. */
  sent: number;
}

/**
 * Sends a chunked body (no Content-Length) of up to `totalBytes`, writing only as fast as the
 * server reads, and stops writing as soon as an answer arrives.
 */
function sendChunked(path: string, headers: Record<string, string>, totalBytes: number, chunk: Buffer): Promise<RawAnswer> {
  const url = new URL(path, APP_URL);
  return new Promise((resolve, reject) => {
    let sent = 0;
    let answered = false;
    const req = httpRequest(
      { host: url.hostname, port: url.port, path: url.pathname, method: 'POST', headers: { origin: APP_URL, ...headers } },
      (res) => {
        answered = true;
        let body = '';
        res.setEncoding('utf8');
        res.on('data', (d) => (body += d));
        res.on('end', () => {
          req.destroy();
          resolve({ status: res.statusCode ?? 0, headers: res.headers, body, sent });
        });
      },
    );
    req.on('error', (err) => (answered ? undefined : reject(err)));
    const pump = () => {
      while (!answered && sent < totalBytes) {
        sent += chunk.length;
        if (!req.write(chunk)) return void req.once('drain', pump);
      }
      if (!answered) req.end();
    };
    pump();
  });
}

const MB = 1024 * 1024;

describe('body limits on the running app', () => {
  it('refuses an anonymous 5 MB sign-in body by its Content-Length with 413 in the error shape', async () => {
    const res = await appFetch('/api/auth/login', {
      method: 'POST',
      headers: { origin: APP_URL, 'content-type': 'application/json' },
      body: JSON.stringify({ email: 'a@b.test', password: 'x'.repeat(5 * MB) }),
    });
    expect(res.status).toBe(413);
    expect(await res.json()).toEqual({ error: { code: 'PAYLOAD_TOO_LARGE', message: 'The request body is larger than 1 MB' } });
  });

  it('stops a chunked 400 MB anonymous sign-in body soon after 1 MB', async () => {
    const answer = await sendChunked('/api/auth/login', { 'content-type': 'application/json' }, 400 * MB, Buffer.alloc(64 * 1024, 0x20));
    expect(answer.status).toBe(413);
    expect(JSON.parse(answer.body).error.code).toBe('PAYLOAD_TOO_LARGE');
    // Socket buffers on both sides hold a few MB; far from the 400 MB offered.
    expect(answer.sent).toBeLessThan(40 * MB);
  });

  it('stops a chunked 200 MB address import soon after its 5 MB limit', async () => {
    const cookie = await signInCookie('admin');
    const answer = await sendChunked('/api/addresses/import', { 'content-type': 'text/csv', cookie }, 200 * MB, Buffer.alloc(64 * 1024, 0x61));
    expect(answer.status).toBe(413);
    expect(JSON.parse(answer.body).error.code).toBe('PAYLOAD_TOO_LARGE');
    expect(answer.sent).toBeLessThan(60 * MB);
  });

  it('refuses a 20 MB write by a signed-in planner with 413', async () => {
    const cookie = await signInCookie('planner');
    const res = await appFetch('/api/customers', {
      method: 'POST',
      cookie,
      headers: { origin: APP_URL, 'content-type': 'application/json' },
      body: JSON.stringify({ name: 'x'.repeat(20 * MB) }),
    });
    expect(res.status).toBe(413);
    expect((await res.json()).error.code).toBe('PAYLOAD_TOO_LARGE');
  });
});
