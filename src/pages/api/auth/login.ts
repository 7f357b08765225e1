import type { APIRoute } from 'astro';
import { authenticate, lucia, setSessionCookie } from '../../../lib/server/auth';
import { LoginSchema, safeNextPath, type LoginErrorCode } from '../../../lib/schemas/auth';
import { AccountDisabledError, type AppError } from '../../../lib/server/errors';
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
    return ctx.redirect(`/login?error=${loginErrorCode(asAppError(err))}&next=${encodeURIComponent(next)}`, 303);
  }
};

/** The sign-in page shows messages by code only, so a link cannot put words on it. */
function loginErrorCode(err: AppError): LoginErrorCode {
  if (err instanceof AccountDisabledError) return 'disabled';
  switch (err.code) {
    case 'UNAUTHORIZED':
      return 'credentials';
    case 'TOO_MANY_REQUESTS':
      return 'throttled';
    case 'BAD_REQUEST':
    case 'PAYLOAD_TOO_LARGE':
    case 'UNSUPPORTED_MEDIA_TYPE':
      return 'invalid';
    case 'SERVICE_UNAVAILABLE':
      return 'unavailable';
    default:
      return 'failed';
  }
}
