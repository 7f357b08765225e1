import { checkHealth } from '../../lib/server/health';
import { json } from '../../lib/server/http';

// Public: load balancers and the start script poll it.
export const GET = async () => {
  try {
    return json(await checkHealth());
  } catch (err) {
    console.error('[bearline] health check failed', err instanceof Error ? err.message : err);
    return json({ ok: false, error: { code: 'SERVICE_UNAVAILABLE', message: 'The database is not reachable' } }, 503);
  }
};
