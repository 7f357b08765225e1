import type { APIRoute } from 'astro';
import { authenticate, lucia, setSessionCookie } from '../../../lib/server/auth';
import { LoginSchema, safeNextPath } from '../../../lib/schemas/auth';
import { asAppError, clientIp, errorResponse, json, parseWith, readBody } from '../../../lib/server/http';

// Accepts JSON (islands, API clients) or a plain form post (works without JavaScript).
export const POST: APIRoute = async (ctx) => {
  const isForm = !(ctx.request.headers.get('content-type') ?? '').includes('application/json');
  let next = '/';
  try {
    const raw = await readBody(ctx.request);
    next = safeNextPath(typeof raw.next === 'string' ? raw.next : null);
    const input = parseWith(LoginSchema, raw);
    const user = await authenticate(input.email, input.password, clientIp(ctx));
    const session = await lucia.createSession(user.id, {});
    setSessionCookie(ctx.cookies, ctx.url, session.id);
    if (isForm) return ctx.redirect(next, 303);
    return json({ user: { id: user.id, email: user.email, name: user.name, role: user.role } });
  } catch (err) {
    if (!isForm) return errorResponse(err);
    const { message, fields } = asAppError(err);
    const detail = fields ? Object.values(fields).flat().join('. ') : message;
    return ctx.redirect(`/login?error=${encodeURIComponent(detail)}&next=${encodeURIComponent(next)}`, 303);
  }
};
