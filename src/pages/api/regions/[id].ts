import { getDb } from '../../../lib/server/db';
import { handler, json, parseBody, parseQuery, parseWith, requirePermission } from '../../../lib/server/http';
import { deleteRegion, findRegion, updateRegion } from '../../../lib/server/repos/regions';
import { REGION_BODY_MAX_BYTES, RegionChangeSchema, RegionOutlineQuerySchema, regionJson } from '../../../lib/schemas/regions';
import { IdParamSchema } from '../../../lib/schemas/params';

/** One region, its outline in full or simplified to one pixel at `?zoom=`. */
export const GET = handler(async ({ locals, params, url }) => {
  requirePermission(locals, 'map:view');
  const { id } = parseWith(IdParamSchema, params);
  const { zoom } = parseQuery(RegionOutlineQuerySchema, url);
  return json(regionJson(await findRegion(getDb(), id, zoom)));
});

export const PATCH = handler(async ({ locals, params, request }) => {
  const actor = requirePermission(locals, 'reference:manage');
  const { id } = parseWith(IdParamSchema, params);
  const change = await parseBody(RegionChangeSchema, request, { maxBytes: REGION_BODY_MAX_BYTES });
  const region = await getDb().transaction((trx) => updateRegion(trx, id, change, actor.id));
  return json(regionJson(region));
});

export const DELETE = handler(async ({ locals, params }) => {
  const actor = requirePermission(locals, 'reference:manage');
  const { id } = parseWith(IdParamSchema, params);
  await getDb().transaction((trx) => deleteRegion(trx, id, actor.id));
  return new Response(null, { status: 204 });
});
