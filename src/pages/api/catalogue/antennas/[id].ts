import { getDb } from '../../../../lib/server/db';
import { handler, json, parseBody, parseWith, requirePermission } from '../../../../lib/server/http';
import { deleteAntenna, findAntenna, updateAntenna } from '../../../../lib/server/repos/catalogue';
import { AntennaChangeSchema, antennaJson } from '../../../../lib/schemas/catalogue';
import { IdParamSchema } from '../../../../lib/schemas/params';

export const GET = handler(async ({ locals, params }) => {
  requirePermission(locals, 'map:view');
  const { id } = parseWith(IdParamSchema, params);
  return json(antennaJson(await findAntenna(getDb(), id)));
});

export const PATCH = handler(async ({ locals, params, request }) => {
  const actor = requirePermission(locals, 'reference:manage');
  const { id } = parseWith(IdParamSchema, params);
  const change = await parseBody(AntennaChangeSchema, request);
  const antenna = await getDb().transaction((trx) => updateAntenna(trx, id, change, actor.id));
  return json(antennaJson(antenna));
});

export const DELETE = handler(async ({ locals, params }) => {
  const actor = requirePermission(locals, 'reference:manage');
  const { id } = parseWith(IdParamSchema, params);
  await getDb().transaction((trx) => deleteAntenna(trx, id, actor.id));
  return new Response(null, { status: 204 });
});
