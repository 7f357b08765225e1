import { getDb } from '../../../lib/server/db';
import { handler, json, parseBody, requirePermission } from '../../../lib/server/http';
import { createOperator, listOperators } from '../../../lib/server/repos/operators';
import { OperatorInputSchema, operatorJson } from '../../../lib/schemas/operators';

export const GET = handler(async ({ locals }) => {
  requirePermission(locals, 'map:view');
  const items = (await listOperators(getDb())).map(operatorJson);
  return json({ items, total: items.length });
});

/** New operator; without a colour it takes the first unused one of the colour-blind-safe palette. */
export const POST = handler(async ({ locals, request }) => {
  const actor = requirePermission(locals, 'reference:manage');
  const input = await parseBody(OperatorInputSchema, request);
  const operator = await getDb().transaction((trx) => createOperator(trx, input, actor.id));
  return json(operatorJson(operator), 201);
});
