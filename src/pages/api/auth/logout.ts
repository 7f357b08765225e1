import type { APIRoute } from 'astro';
import { lucia, setSessionCookie } from '../../../lib/server/auth';
import { handler, json } from '../../../lib/server/http';

export const POST: APIRoute = handler(async (ctx) => {
  if (ctx.locals.session) await lucia.invalidateSession(ctx.locals.session.id);
  setSessionCookie(ctx.cookies, ctx.url, null);
  const wantsJson =
    (ctx.request.headers.get('accept') ?? '').includes('application/json') || (ctx.request.headers.get('content-type') ?? '').includes('application/json');
  return wantsJson ? json({ ok: true }) : ctx.redirect('/login', 303);
});
