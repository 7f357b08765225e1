import { getDb } from '../../../lib/server/db';
import { handler, json, parseBody, parseWith, requirePermission } from '../../../lib/server/http';
import { findOperator, updateOperator } from '../../../lib/server/repos/operators';
import { OperatorChangeSchema, operatorJson } from '../../../lib/schemas/operators';
import { IdParamSchema } from '../../../lib/schemas/params';

export const GET = handler(async ({ locals, params }) => {
  requirePermission(locals, 'map:view');
  const { id } = parseWith(IdParamSchema, params);
  return json(operatorJson(await findOperator(getDb(), id)));
});

export const PATCH = handler(async ({ locals, params, request }) => {
  const actor = requirePermission(locals, 'reference:manage');
  const { id } = parseWith(IdParamSchema, params);
  const change = await parseBody(OperatorChangeSchema, request);
  const operator = await getDb().transaction((trx) => updateOperator(trx, id, change, actor.id));
  return json(operatorJson(operator));
});
