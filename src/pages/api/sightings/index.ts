import { getDb } from '../../../lib/server/db';
import { getStorage } from '../../../lib/server/files';
import { handler, json, parseQuery, requirePermission } from '../../../lib/server/http';
import { readMultipartFiles } from '../../../lib/server/request-body';
import { SIGHTING_UPLOAD_LIMITS, submitSighting } from '../../../lib/server/sighting-service';
import { listSightings } from '../../../lib/server/repos/sightings';
import { SightingListQuerySchema, sightingJson, type SightingCreatedJson, type SightingListJson } from '../../../lib/schemas/sightings';
import { can } from '../../../lib/domain/roles';

/**
 * `?mine=1`: the caller's own sightings, newest first (surveyors and contributors). Without it:
 * every sighting, filtered by `status`, oldest first (reviewers and admins).
 */
export const GET = handler(async ({ locals, url }) => {
  const query = parseQuery(SightingListQuerySchema, url);
  const user = requirePermission(locals, query.mine ? 'sightings:submit' : 'sightings:review');
  const list = await listSightings(getDb(), {
    authorId: query.mine ? user.id : undefined,
    status: query.status,
    oldestFirst: !query.mine,
    limit: query.limit,
    offset: query.offset,
  });
  const withOriginals = can(user.role, 'sightings:review');
  const body: SightingListJson = { items: list.items.map((s) => sightingJson(s, { withOriginals })), total: list.total };
  return json(body);
});

/**
 * multipart/form-data: a part "sighting" (JSON, SightingInputSchema) and up to six parts "photo".
 * 201 with the new sighting; 200 with the first one when its client_uuid was sent before.
 */
export const POST = handler(async ({ locals, request }) => {
  const user = requirePermission(locals, 'sightings:submit');
  const body = await readMultipartFiles(request, SIGHTING_UPLOAD_LIMITS);
  const { sighting, created } = await submitSighting(getDb(), getStorage(), user.id, body);
  const out: SightingCreatedJson = { id: sighting.id, status: sighting.status };
  return json(out, created ? 201 : 200, created ? { Location: `/api/sightings/${sighting.id}` } : {});
});
