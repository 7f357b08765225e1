import { getDb } from '../../../lib/server/db';
import { handler, json, parseQuery, requirePermission } from '../../../lib/server/http';
import { listPendingSightings } from '../../../lib/server/repos/sightings';
import { PendingSightingQuerySchema, pendingSightingsJson } from '../../../lib/schemas/sightings';
import { can } from '../../../lib/domain/roles';

/** Pending sightings as GeoJSON for the map: reviewers and admins see all, everyone else only their own. */
export const GET = handler(async ({ locals, url }) => {
  const user = requirePermission(locals, 'map:view');
  const { bbox } = parseQuery(PendingSightingQuerySchema, url);
  const rows = await listPendingSightings(getDb(), { userId: user.id, seesAll: can(user.role, 'sightings:review') }, bbox);
  return json(pendingSightingsJson(rows, user.id));
});
