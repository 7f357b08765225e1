import { getDb } from '../../../lib/server/db';
import { handler, json, parseBody, parseWith, requirePermission } from '../../../lib/server/http';
import { deleteCell, findCell, updateCell } from '../../../lib/server/repos/cells';
import { cellJson } from '../../../lib/schemas/mast-responses';
import { CellChangeSchema } from '../../../lib/schemas/masts';
import { IdParamSchema } from '../../../lib/schemas/params';

export const GET = handler(async ({ locals, params }) => {
  requirePermission(locals, 'map:view');
  const { id } = parseWith(IdParamSchema, params);
  return json(cellJson(await findCell(getDb(), id)));
});

/** Partial update, checked again as a whole (channel in band, PCI range). */
export const PATCH = handler(async ({ locals, params, request }) => {
  const actor = requirePermission(locals, 'masts:write');
  const { id } = parseWith(IdParamSchema, params);
  const change = await parseBody(CellChangeSchema, request);
  const cell = await getDb().transaction((trx) => updateCell(trx, id, change, actor.id));
  return json(cellJson(cell));
});

export const DELETE = handler(async ({ locals, params }) => {
  const actor = requirePermission(locals, 'masts:write');
  const { id } = parseWith(IdParamSchema, params);
  await getDb().transaction((trx) => deleteCell(trx, id, actor.id));
  return new Response(null, { status: 204 });
});
