import { getDb } from '../../../lib/server/db';
import { handler, json, parseBody, parseWith, requirePermission } from '../../../lib/server/http';
import { deleteRegion, findRegion, regionJson, updateRegion } from '../../../lib/server/repos/regions';
import { REGION_BODY_MAX_BYTES, RegionChangeSchema } from '../../../lib/schemas/regions';
import { IdParamSchema } from '../../../lib/schemas/params';

export const GET = handler(async ({ locals, params }) => {
  requirePermission(locals, 'map:view');
  const { id } = parseWith(IdParamSchema, params);
  return json(regionJson(await findRegion(getDb(), id)));
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
