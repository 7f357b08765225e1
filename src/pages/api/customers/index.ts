import { getDb } from '../../../lib/server/db';
import { handler, json, parseBody, parseQuery, requirePermission } from '../../../lib/server/http';
import { createCustomer, listCustomers } from '../../../lib/server/repos/customers';
import { CustomerInputSchema, CustomerListQuerySchema, customerJson } from '../../../lib/schemas/customers';

export const GET = handler(async ({ locals, url }) => {
  requirePermission(locals, 'plans:view');
  const query = parseQuery(CustomerListQuerySchema, url);
  const { items, total } = await listCustomers(getDb(), query);
  return json({ items: items.map(customerJson), total });
});

export const POST = handler(async ({ locals, request }) => {
  const actor = requirePermission(locals, 'plans:write');
  const input = await parseBody(CustomerInputSchema, request);
  const customer = await getDb().transaction((trx) => createCustomer(trx, input, actor.id));
  return json(customerJson(customer), 201);
});
