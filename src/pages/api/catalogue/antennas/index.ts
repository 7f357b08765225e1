import { getDb } from '../../../../lib/server/db';
import { handler, json, parseBody, requirePermission } from '../../../../lib/server/http';
import { createAntenna, listAntennas } from '../../../../lib/server/repos/catalogue';
import { AntennaInputSchema, antennaJson } from '../../../../lib/schemas/catalogue';

// Every signed-in role reads the catalogue (planner kit picker, map tools); admins edit it.
export const GET = handler(async ({ locals }) => {
  requirePermission(locals, 'map:view');
  const items = (await listAntennas(getDb())).map(antennaJson);
  return json({ items, total: items.length });
});

export const POST = handler(async ({ locals, request }) => {
  const actor = requirePermission(locals, 'reference:manage');
  const input = await parseBody(AntennaInputSchema, request);
  const antenna = await getDb().transaction((trx) => createAntenna(trx, input, actor.id));
  return json(antennaJson(antenna), 201);
});
