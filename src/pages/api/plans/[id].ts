import { getDb } from '../../../lib/server/db';
import { handler, json, parseBody, parseWith, requirePermission } from '../../../lib/server/http';
import { findPlanDetail } from '../../../lib/server/repos/plans';
import { changePlan } from '../../../lib/server/plan-service';
import { getElevationProfile } from '../../../lib/server/elevation-service';
import { PlanChangeSchema, planDetailJson } from '../../../lib/schemas/plans';
import { syncInstallReadings } from '../../../lib/server/repos/install-feedback';
import { IdParamSchema } from '../../../lib/schemas/params';

// The plan with its install checks and the measured result against the prediction.
export const GET = handler(async ({ locals, params }) => {
  requirePermission(locals, 'plans:view');
  const { id } = parseWith(IdParamSchema, params);
  return json(planDetailJson(await findPlanDetail(getDb(), id)));
});

export const PATCH = handler(async ({ locals, params, request }) => {
  const actor = requirePermission(locals, 'plans:write');
  const { id } = parseWith(IdParamSchema, params);
  const change = await parseBody(PlanChangeSchema, request);
  await getDb().transaction(async (trx) => {
    await changePlan(trx, id, change, actor.id, new Date(), getElevationProfile);
    if (change.state !== undefined) await syncInstallReadings(trx, id);
  });
  return json(planDetailJson(await findPlanDetail(getDb(), id)));
});
