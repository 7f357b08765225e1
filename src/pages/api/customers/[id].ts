import { getDb } from '../../../lib/server/db';
import { handler, json, parseBody, parseWith, requirePermission } from '../../../lib/server/http';
import { findCustomer, updateCustomer } from '../../../lib/server/repos/customers';
import { CustomerChangeSchema, customerJson } from '../../../lib/schemas/customers';
import { IdParamSchema } from '../../../lib/schemas/params';

export const GET = handler(async ({ locals, params }) => {
  requirePermission(locals, 'plans:view');
  const { id } = parseWith(IdParamSchema, params);
  return json(customerJson(await findCustomer(getDb(), id)));
});

export const PATCH = handler(async ({ locals, params, request }) => {
  const actor = requirePermission(locals, 'plans:write');
  const { id } = parseWith(IdParamSchema, params);
  const change = await parseBody(CustomerChangeSchema, request);
  const customer = await getDb().transaction((trx) => updateCustomer(trx, id, change, actor.id));
  return json(customerJson(customer));
});
