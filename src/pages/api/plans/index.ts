import { getDb } from '../../../lib/server/db';
import { handler, json, parseBody, parseQuery, requirePermission, requireUser } from '../../../lib/server/http';
import { ForbiddenError } from '../../../lib/server/errors';
import { canViewPlans } from '../../../lib/domain/plan-state';
import { createPlan, listPlans, planJson } from '../../../lib/server/repos/plans';
import { PlanInputSchema, PlanListQuerySchema } from '../../../lib/schemas/plans';

export const GET = handler(async ({ locals, url }) => {
  if (!canViewPlans(requireUser(locals).role)) throw new ForbiddenError();
  const query = parseQuery(PlanListQuerySchema, url);
  const { items, total } = await listPlans(getDb(), query);
  return json({ items: items.map(planJson), total });
});

export const POST = handler(async ({ locals, request }) => {
  const actor = requirePermission(locals, 'plans:write');
  const input = await parseBody(PlanInputSchema, request);
  const plan = await getDb().transaction((trx) => createPlan(trx, input, actor.id));
  return json(planJson(plan), 201);
});
