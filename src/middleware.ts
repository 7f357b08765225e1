import { defineMiddleware } from 'astro:middleware';
import { lucia, setSessionCookie } from './lib/server/auth';
import { json } from './lib/server/http';
import { isForeignWrite } from './lib/server/origin';
import { config } from './lib/server/config';
import { getDb } from './lib/server/db';
import { startResidualJob } from './lib/server/residual-job';
import { startBackgroundWork } from './lib/server/background';

export const onRequest = defineMiddleware(async (context, next) => {
  // Stores model residuals for new or changed readings in the background (once per process).
  if (config.databaseUrl) startResidualJob(getDb(), config.dataDir);
  // Tells reviewers that sightings wait (at most hourly each; once per process).
  if (config.databaseUrl) startBackgroundWork(context.url.origin);
  if (isForeignWrite(context.request, context.url)) {
    return json({ error: { code: 'FORBIDDEN', message: 'Cross-site request refused' } }, 403);
  }

  context.locals.user = null;
  context.locals.session = null;
  const sessionId = context.cookies.get(lucia.sessionCookieName)?.value ?? null;
  if (sessionId) {
    try {
      const { session, user } = await lucia.validateSession(sessionId);
      if (session?.fresh) setSessionCookie(context.cookies, context.url, session.id);
      if (!session) setSessionCookie(context.cookies, context.url, null);
      if (session && user && !user.disabledAt) {
        context.locals.session = session;
        context.locals.user = { id: user.id, email: user.email, name: user.name, role: user.role };
      }
    } catch (err) {
      // Database down: carry on signed out; /api/health reports the cause.
      console.error('[bearline] session lookup failed', err instanceof Error ? err.message : err);
    }
  }
  return next();
});
