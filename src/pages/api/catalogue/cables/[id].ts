import { getDb } from '../../../../lib/server/db';
import { handler, json, parseBody, parseWith, requirePermission } from '../../../../lib/server/http';
import { deleteCable, findCable, updateCable } from '../../../../lib/server/repos/catalogue';
import { CableChangeSchema, cableJson } from '../../../../lib/schemas/catalogue';
import { IdParamSchema } from '../../../../lib/schemas/params';

export const GET = handler(async ({ locals, params }) => {
  requirePermission(locals, 'map:view');
  const { id } = parseWith(IdParamSchema, params);
  return json(cableJson(await findCable(getDb(), id)));
});

export const PATCH = handler(async ({ locals, params, request }) => {
  const actor = requirePermission(locals, 'reference:manage');
  const { id } = parseWith(IdParamSchema, params);
  const change = await parseBody(CableChangeSchema, request);
  const antenna = await getDb().transaction((trx) => updateCable(trx, id, change, actor.id));
  return json(cableJson(antenna));
});

export const DELETE = handler(async ({ locals, params }) => {
  const actor = requirePermission(locals, 'reference:manage');
  const { id } = parseWith(IdParamSchema, params);
  await getDb().transaction((trx) => deleteCable(trx, id, actor.id));
  return new Response(null, { status: 204 });
});
