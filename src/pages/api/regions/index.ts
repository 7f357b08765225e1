import { getDb } from '../../../lib/server/db';
import { handler, json, parseBody, parseQuery, requirePermission } from '../../../lib/server/http';
import { createRegion, listRegions } from '../../../lib/server/repos/regions';
import { REGION_BODY_MAX_BYTES, RegionInputSchema, RegionListQuerySchema, regionJson } from '../../../lib/schemas/regions';

/** Every region with its outline simplified to one pixel at `?zoom=` (default 8) and its bbox. */
export const GET = handler(async ({ locals, url }) => {
  requirePermission(locals, 'map:view');
  const { zoom } = parseQuery(RegionListQuerySchema, url);
  const items = (await listRegions(getDb(), zoom)).map(regionJson);
  return json({ items, total: items.length });
});

/** Imports a GeoJSON Polygon or MultiPolygon (bare or as a Feature); invalid polygons are refused. */
export const POST = handler(async ({ locals, request }) => {
  const actor = requirePermission(locals, 'reference:manage');
  const input = await parseBody(RegionInputSchema, request, { maxBytes: REGION_BODY_MAX_BYTES });
  const region = await getDb().transaction((trx) => createRegion(trx, input, actor.id));
  return json(regionJson(region), 201);
});
