import { checkHealth } from '../../lib/server/health';
import { errorBody, json } from '../../lib/server/http';
import { AppError } from '../../lib/server/errors';

// Public: load balancers and the start script poll it.
export const GET = async () => {
  try {
    return json(await checkHealth());
  } catch (err) {
    console.error('[bearline] health check failed', err instanceof Error ? err.message : err);
    return json({ ok: false, ...errorBody(new AppError('SERVICE_UNAVAILABLE', 'The database is not reachable')) }, 503);
  }
};
