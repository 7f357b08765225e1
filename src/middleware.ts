import { defineMiddleware } from 'astro:middleware';
import type { APIContext } from 'astro';
import { AppError, ForbiddenError, type ErrorCode } from './lib/server/errors';
import { lucia, setSessionCookie } from './lib/server/auth';
import { validateSessionCached } from './lib/server/session-cache';
import { noteLocalWrite } from './lib/server/write-epoch';
import { errorResponse } from './lib/server/http';
import { isForeignWrite } from './lib/server/origin';
import { startProcessWork } from './lib/server/process-start';
import { rememberRequestOrigin } from './lib/server/background';
import { DATABASE_UNAVAILABLE_MESSAGE, isDatabaseUnavailable } from './lib/server/db-errors';
import { allowedApiMethods, methodNotAllowed, PAGE_METHODS } from './lib/server/methods';
import { API_CSP, COMMON_HEADERS, contentSecurityPolicy, inlineScriptHashes, mutable } from './lib/server/security-headers';

const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);

const isApiPath = (pathname: string) => pathname === '/api' || pathname.startsWith('/api/');

export const onRequest = defineMiddleware(async (context, next) => {
  // Job queue, periodic work, change feed and shortlist warm-up: started by server/serve.mjs when the
  // process starts; here only the first time for a server started otherwise (astro dev). No-op after.
  startProcessWork();
  // Links in reviewer alerts point where requests come, unless PUBLIC_ORIGIN says otherwise.
  rememberRequestOrigin(context.url.origin);
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
