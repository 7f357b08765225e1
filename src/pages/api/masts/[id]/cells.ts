import { getDb } from '../../../../lib/server/db';
import { handler, json, parseBody, parseWith, requirePermission } from '../../../../lib/server/http';
import { createCell, listCellsOfExistingMast } from '../../../../lib/server/repos/cells';
import { cellJson } from '../../../../lib/schemas/mast-responses';
import { CellInputSchema } from '../../../../lib/schemas/masts';
import { IdParamSchema } from '../../../../lib/schemas/params';

export const GET = handler(async ({ locals, params }) => {
  requirePermission(locals, 'map:view');
  const { id } = parseWith(IdParamSchema, params);
  const items = (await listCellsOfExistingMast(getDb(), id)).map(cellJson);
  return json({ items, total: items.length });
});

/** Adds a cell; the channel must lie in the band (derived from the channel when no band is given). */
export const POST = handler(async ({ locals, params, request }) => {
  const actor = requirePermission(locals, 'masts:write');
  const { id } = parseWith(IdParamSchema, params);
  const input = await parseBody(CellInputSchema, request);
  const cell = await getDb().transaction((trx) => createCell(trx, id, input, actor.id));
  return json(cellJson(cell), 201);
});
