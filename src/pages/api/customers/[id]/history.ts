import { getDb } from '../../../../lib/server/db';
import { handler, json, parseWith, requirePermission } from '../../../../lib/server/http';
import { listCustomerHistory } from '../../../../lib/server/repos/customers';
import { IdParamSchema } from '../../../../lib/schemas/params';

// The audit trail of a customer and their plans, newest first.
export const GET = handler(async ({ locals, params }) => {
  requirePermission(locals, 'plans:view');
  const { id } = parseWith(IdParamSchema, params);
  const items = await listCustomerHistory(getDb(), id);
  return json({ items, total: items.length });
});
