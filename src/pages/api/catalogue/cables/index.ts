import { getDb } from '../../../../lib/server/db';
import { handler, json, parseBody, requirePermission } from '../../../../lib/server/http';
import { createCable, listCables } from '../../../../lib/server/repos/catalogue';
import { CableInputSchema, cableJson } from '../../../../lib/schemas/catalogue';

// Every signed-in role reads the catalogue (planner kit picker, map tools); admins edit it.
export const GET = handler(async ({ locals }) => {
  requirePermission(locals, 'map:view');
  const items = (await listCables(getDb())).map(cableJson);
  return json({ items, total: items.length });
});

export const POST = handler(async ({ locals, request }) => {
  const actor = requirePermission(locals, 'reference:manage');
  const input = await parseBody(CableInputSchema, request);
  const antenna = await getDb().transaction((trx) => createCable(trx, input, actor.id));
  return json(cableJson(antenna), 201);
});
