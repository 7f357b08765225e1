// Calls an exported Astro endpoint handler with a constructed context.
import type { APIContext, APIRoute } from 'astro';
import type { SessionUser } from '../../src/lib/server/session-user';

export interface CallOptions {
  method?: string;
  url?: string;
  params?: Record<string, string | undefined>;
  user?: SessionUser | null;
  json?: unknown;
  form?: Record<string, string>;
  body?: BodyInit;
  headers?: Record<string, string>;
  /** The caller's IP address (default 127.0.0.1). */
  clientAddress?: string;
}

export interface CallResult {
  status: number;
  headers: Headers;
  body: any; // eslint-disable-line @typescript-eslint/no-explicit-any
  /** The body as sent, before any JSON parsing. */
  text: string;
}

export async function call(route: APIRoute, opts: CallOptions = {}): Promise<CallResult> {
  const url = new URL(opts.url ?? '/api/test', 'http://127.0.0.1:4321');
  const headers = new Headers(opts.headers);
  let body: BodyInit | undefined = opts.body;
  if (opts.json !== undefined) {
    body = JSON.stringify(opts.json);
    headers.set('content-type', 'application/json');
  } else if (opts.form) {
    body = new URLSearchParams(opts.form);
    headers.set('content-type', 'application/x-www-form-urlencoded');
  }
  const request = new Request(url, { method: opts.method ?? (body ? 'POST' : 'GET'), headers, body });
  const cookieJar = new Map<string, string>();
  const ctx = {
    request,
    url,
    params: opts.params ?? {},
    locals: { user: opts.user ?? null, session: null },
    clientAddress: opts.clientAddress ?? '127.0.0.1',
    cookies: {
      get: (name: string) => (cookieJar.has(name) ? { value: cookieJar.get(name)! } : undefined),
      set: (name: string, value: string) => cookieJar.set(name, value),
      delete: (name: string) => cookieJar.delete(name),
      has: (name: string) => cookieJar.has(name),
    },
    redirect: (path: string, status = 302) => new Response(null, { status, headers: { Location: path } }),
  } as unknown as APIContext;
  const res = await route(ctx);
  const text = await res.text();
  let parsed: unknown = text;
  try {
    parsed = text ? JSON.parse(text) : null;
  } catch {
    /* not JSON: keep the text */
  }
  return { status: res.status, headers: res.headers, body: parsed, text };
}
