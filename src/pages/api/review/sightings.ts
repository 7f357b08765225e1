import { getDb } from '../../../lib/server/db';
import { handler, json, parseQuery, requirePermission } from '../../../lib/server/http';
import { listReviewQueue } from '../../../lib/server/repos/sighting-review';
import { DUPLICATE_RADIUS_M } from '../../../lib/domain/duplicates';
import { ReviewQueueQuerySchema, reviewQueueJson } from '../../../lib/schemas/review';

/** The review queue: pending sightings oldest first, with possible duplicates within 300 m and each submitter's record. */
export const GET = handler(async ({ locals, url }) => {
  requirePermission(locals, 'sightings:review');
  const page = parseQuery(ReviewQueueQuerySchema, url);
  return json(reviewQueueJson(await listReviewQueue(getDb(), page), DUPLICATE_RADIUS_M));
});
