import { getDb } from '../../../lib/server/db';
import { handler, json, parseBody, parseQuery, requirePermission } from '../../../lib/server/http';
import { listPlans } from '../../../lib/server/repos/plans';
import { savePlan } from '../../../lib/server/plan-service';
import { getElevationProfile } from '../../../lib/server/elevation-service';
import { PlanInputSchema, PlanListQuerySchema, planJson } from '../../../lib/schemas/plans';

export const GET = handler(async ({ locals, url }) => {
  requirePermission(locals, 'plans:view');
  const query = parseQuery(PlanListQuerySchema, url);
  const { items, total } = await listPlans(getDb(), query);
  return json({ items: items.map(planJson), total });
});

export const POST = handler(async ({ locals, request }) => {
  const actor = requirePermission(locals, 'plans:write');
  const input = await parseBody(PlanInputSchema, request);
  // A new customer and the plan are one transaction: a failed save leaves neither behind.
  const plan = await getDb().transaction((trx) => savePlan(trx, input, actor.id, new Date(), getElevationProfile));
  return json(planJson(plan), 201);
});
