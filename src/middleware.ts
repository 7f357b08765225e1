import { defineMiddleware } from 'astro:middleware';
import type { APIContext } from 'astro';
import { AppError, ForbiddenError, type ErrorCode } from './lib/server/errors';
import { lucia, setSessionCookie } from './lib/server/auth';
import { validateSessionCached } from './lib/server/session-cache';
import { startChangeFeed } from './lib/server/change-feed';
import { noteLocalWrite } from './lib/server/write-epoch';
import { errorResponse } from './lib/server/http';
import { isForeignWrite } from './lib/server/origin';
import { config } from './lib/server/config';
import { getDb } from './lib/server/db';
import { startResidualJob } from './lib/server/residual-job';
import { startBackgroundWork } from './lib/server/background';
import { warmShortlist } from './lib/server/shortlist-warmup';
import { startJobQueueInBackground } from './lib/server/jobs/runtime';
import { DATABASE_UNAVAILABLE_MESSAGE, isDatabaseUnavailable } from './lib/server/db-errors';
import { allowedApiMethods, methodNotAllowed, PAGE_METHODS } from './lib/server/methods';
import { API_CSP, COMMON_HEADERS, contentSecurityPolicy, inlineScriptHashes, mutable } from './lib/server/security-headers';

const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);

const isApiPath = (pathname: string) => pathname === '/api' || pathname.startsWith('/api/');

export const onRequest = defineMiddleware(async (context, next) => {
  // Stores model residuals for new or changed readings in the background (once per process).
  if (config.databaseUrl) startResidualJob(getDb(), config.dataDir);
  // Elevation grids in memory and the shortlist's code run once, before the first planner asks.
  if (config.databaseUrl) void warmShortlist();
  // Tells reviewers that sightings wait (at most hourly each; once per process).
  if (config.databaseUrl) startBackgroundWork(context.url.origin);
  // The job queue and this instance's workers (imports), once per process.
  startJobQueueInBackground();
  // Data versions and session changes pushed by PostgreSQL, once per process.
  startChangeFeed(config.databaseUrl);
  const api = isApiPath(context.url.pathname);
  const response = await answer(context, next, api);
  return secure(response, api);
});

async function answer(context: APIContext, next: () => Promise<Response>, api: boolean): Promise<Response> {
  const method = context.request.method.toUpperCase();
  const pathname = context.url.pathname;

  // Pages are read with GET (forms post to the API). TRACE never gets here (server/serve.mjs).
  if (!api && !pathname.startsWith('/_') && !PAGE_METHODS.includes(method)) return methodNotAllowed(false, PAGE_METHODS);

  if (isForeignWrite(context.request, context.url)) {
    return errorResponse(new ForbiddenError('Cross-site request refused'));
  }

  context.locals.user = null;
  context.locals.session = null;
  const sessionId = context.cookies.get(lucia.sessionCookieName)?.value ?? null;
  if (sessionId) {
    try {
      const { session, user } = await validateSessionCached(sessionId);
      if (session?.fresh) setSessionCookie(context.cookies, context.url, session.id);
      if (!session) setSessionCookie(context.cookies, context.url, null);
      if (session && user && !user.disabledAt) {
        context.locals.session = session;
        context.locals.user = { id: user.id, email: user.email, name: user.name, role: user.role };
      }
    } catch (err) {
      // Who is signed in cannot be known: say so (503), rather than treat them as signed out.
      console.error('[bearline] session lookup failed', err instanceof Error ? err.message : err);
      if (isDatabaseUnavailable(err)) return unavailable(api);
      if (api) return errorResponse(err);
      throw err;
    }
  }

  let response: Response;
  try {
    response = await next();
  } catch (err) {
    if (api) return errorResponse(err);
    if (isDatabaseUnavailable(err)) return unavailable(false);
    throw err;
  } finally {
    // In-memory copies on this machine read the database again after anything that may have written.
    if (!SAFE_METHODS.has(method)) noteLocalWrite();
  }

  if (api) {
    // Astro answers a method the route does not export with an empty 404.
    if (response.status === 404 && !response.headers.get('content-type')) {
      const allowed = await allowedApiMethods(context.routePattern);
      if (allowed && !allowed.includes(method)) {
        if (method === 'OPTIONS') return new Response(null, { status: 204, headers: { Allow: allowed.join(', ') } });
        return methodNotAllowed(true, allowed);
      }
    }
    // Every API error in the error shape, whatever produced it.
    if (response.status >= 400 && !(response.headers.get('content-type') ?? '').includes('application/json')) {
      return errorResponse(statusError(response.status));
    }
  }
  return response;
}

function statusError(status: number): AppError {
  const codes: Record<number, [ErrorCode, string]> = {
    400: ['BAD_REQUEST', 'The request could not be read'],
    403: ['FORBIDDEN', 'Refused'],
    404: ['NOT_FOUND', 'Not found'],
    413: ['PAYLOAD_TOO_LARGE', 'The request body is too large'],
  };
  const [code, message] = codes[status] ?? ['INTERNAL_SERVER_ERROR', 'Something went wrong on the server'];
  return new AppError(code, message);
}

function unavailable(api: boolean): Response {
  if (api) {
    return errorResponse(new AppError('SERVICE_UNAVAILABLE', DATABASE_UNAVAILABLE_MESSAGE, undefined, { 'Retry-After': '30' }));
  }
  const html = `<!doctype html><html lang="en"><head><meta charset="utf-8"><title>Bearline is unavailable</title>
<meta name="viewport" content="width=device-width, initial-scale=1"></head>
<body style="font-family: system-ui, sans-serif; max-width: 32rem; margin: 4rem auto; padding: 0 1rem; color: #1f2933">
<h1 style="font-size: 1.4rem">Bearline cannot reach its database</h1>
<p>${DATABASE_UNAVAILABLE_MESSAGE}. Your work is not lost: nothing was changed.</p>
<p><a href="">Try again</a></p></body></html>`;
  return new Response(html, { status: 503, headers: { 'Content-Type': 'text/html; charset=utf-8', 'Retry-After': '30' } });
}

/** Security headers on every answer; no caching of pages and API answers unless a route says so. */
async function secure(response: Response, api: boolean): Promise<Response> {
  let res = response;
  const type = res.headers.get('content-type') ?? '';
  if (type.includes('text/html') && import.meta.env.PROD) {
    const html = await res.text();
    res = mutable(res, html);
    res.headers.set('Content-Security-Policy', contentSecurityPolicy(inlineScriptHashes(html)));
  } else {
    res = mutable(res);
    if (api || !type.includes('text/html')) res.headers.set('Content-Security-Policy', API_CSP);
    else res.headers.set('Content-Security-Policy', "frame-ancestors 'none'");
  }
  for (const [name, value] of Object.entries(COMMON_HEADERS)) res.headers.set(name, value);
  if (!res.headers.has('cache-control')) res.headers.set('Cache-Control', 'no-store');
  return res;
}
