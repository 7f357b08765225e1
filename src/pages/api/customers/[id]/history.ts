import { getDb } from '../../../../lib/server/db';
import { handler, json, parseWith, requireUser } from '../../../../lib/server/http';
import { ForbiddenError } from '../../../../lib/server/errors';
import { canViewPlans } from '../../../../lib/domain/plan-state';
import { listCustomerHistory } from '../../../../lib/server/repos/customers';
import { IdParamSchema } from '../../../../lib/schemas/params';

// The audit trail of a customer and their plans, newest first.
export const GET = handler(async ({ locals, params }) => {
  if (!canViewPlans(requireUser(locals).role)) throw new ForbiddenError();
  const { id } = parseWith(IdParamSchema, params);
  const items = await listCustomerHistory(getDb(), id);
  return json({ items, total: items.length });
});
