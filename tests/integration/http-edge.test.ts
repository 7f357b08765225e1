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
    const req = httpRequest({ host: url.hostname, port: url.port, path: url.pathname, method: 'POST', headers: { origin: APP_URL, ...headers } }, (res) => {
      answered = true;
      let body = '';
      res.setEncoding('utf8');
      res.on('data', (d) => (body += d));
      res.on('end', () => {
        req.destroy();
        resolve({ status: res.statusCode ?? 0, headers: res.headers, body, sent });
      });
    });
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

  it('stops a chunked 200 MB address import of one endless line soon after the 1 MB line limit', async () => {
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

describe('security headers', () => {
  it('sends a CSP that lets MapLibre workers run, and no framing, sniffing or caching on private pages', async () => {
    const cookie = await signInCookie('planner');
    const res = await appFetch('/map', { cookie });
    expect(res.status).toBe(200);
    const csp = res.headers.get('content-security-policy') ?? '';
    expect(csp).toContain("frame-ancestors 'none'");
    expect(csp).toContain("default-src 'self'");
    expect(csp).toMatch(/worker-src [^;]*blob:/);
    expect(csp).toMatch(/img-src [^;]*blob:/);
    expect(csp).not.toMatch(/script-src [^;]*'unsafe-inline'/);
    expect(res.headers.get('x-content-type-options')).toBe('nosniff');
    expect(res.headers.get('x-frame-options')).toBe('DENY');
    expect(res.headers.get('referrer-policy')).toBe('same-origin');
    expect(res.headers.get('cache-control')).toBe('no-store');
    // Every inline script on the page is allowed by its hash, so the page still runs.
    const html = await res.text();
    const { inlineScriptHashes } = await import('../../src/lib/server/security-headers');
    for (const hash of inlineScriptHashes(html)) expect(csp).toContain(`'${hash}'`);
  });

  it('marks API answers no-store and nosniff, errors included', async () => {
    const cookie = await signInCookie('planner');
    for (const path of ['/api/me', '/api/masts/999999999', '/api/no/such/route']) {
      const res = await appFetch(path, { cookie });
      expect(res.headers.get('cache-control')).toBe('no-store');
      expect(res.headers.get('x-content-type-options')).toBe('nosniff');
      expect(res.headers.get('content-security-policy')).toContain("default-src 'none'");
      expect(res.headers.get('content-type')).toContain('application/json');
    }
  });
});

describe('methods', () => {
  it('answers a method a route does not export with a JSON 405 and Allow', async () => {
    const cookie = await signInCookie('admin');
    const res = await appFetch('/api/masts', { method: 'DELETE', cookie, headers: { origin: APP_URL } });
    expect(res.status).toBe(405);
    expect(res.headers.get('allow')).toBe('GET, POST, HEAD');
    expect((await res.json()).error.code).toBe('METHOD_NOT_ALLOWED');
    const anon = await appFetch('/api/health', { method: 'PUT', headers: { origin: APP_URL } });
    expect(anon.status).toBe(405);
    expect(anon.headers.get('allow')).toBe('GET, HEAD');
    const options = await appFetch('/api/masts/1', { method: 'OPTIONS' });
    expect(options.status).toBe(204);
    expect(options.headers.get('allow')).toContain('PATCH');
  });

  it('refuses writes to pages with 405', async () => {
    const res = await appFetch('/map', { method: 'POST', headers: { origin: APP_URL, 'content-type': 'application/x-www-form-urlencoded' }, body: 'a=1' });
    expect(res.status).toBe(405);
    expect(res.headers.get('allow')).toBe('GET, HEAD');
  });

  it('refuses TRACE cleanly (405, not 500), on pages and the API', async () => {
    const send = (path: string) =>
      new Promise<{ status: number; allow?: string; body: string }>((resolve, reject) => {
        const url = new URL(path, APP_URL);
        const req = httpRequest({ host: url.hostname, port: url.port, path, method: 'TRACE' }, (res) => {
          let body = '';
          res.on('data', (d) => (body += d));
          res.on('end', () => resolve({ status: res.statusCode ?? 0, allow: res.headers.allow, body }));
        });
        req.on('error', reject);
        req.end();
      });
    const api = await send('/api/masts');
    expect(api.status).toBe(405);
    expect(JSON.parse(api.body).error.code).toBe('METHOD_NOT_ALLOWED');
    const page = await send('/');
    expect(page.status).toBe(405);
    expect(page.allow).toBe('GET, HEAD');
  });
});

describe('forwarded addresses', () => {
  it('does not let a client escape the per-address sign-in limit by writing X-Forwarded-For', async () => {
    const { IP_FAILURE_LIMIT } = await import('../../src/lib/server/auth');
    const pg = await import('pg');
    const db = new pg.default.Client({ connectionString: process.env.E2E_DATABASE_URL });
    await db.connect();
    try {
      let last = 0;
      for (let i = 0; i <= IP_FAILURE_LIMIT; i++) {
        const res = await appFetch('/api/auth/login', {
          method: 'POST',
          headers: { origin: APP_URL, 'content-type': 'application/json', 'x-forwarded-for': `198.51.100.${i}` },
          body: JSON.stringify({ email: `spray${i}@example.test`, password: 'Winter2025!' }),
        });
        last = res.status;
      }
      expect(last).toBe(429);
      const { rows } = await db.query<{ ip: string }>(`SELECT DISTINCT ip FROM login_failures WHERE email LIKE 'spray%'`);
      expect(rows.map((r) => r.ip)).toEqual(['127.0.0.1']);
    } finally {
      // The other tests sign in from this address too.
      await db.query(`DELETE FROM login_failures WHERE ip = '127.0.0.1'`);
      await db.end();
    }
  });
});
