import { getDb } from '../../../../lib/server/db';
import { handler, json, parseBody, parseWith, requirePermission } from '../../../../lib/server/http';
import { MARK_INSTALLED_PERMISSIONS } from '../../../../lib/domain/plan-state';
import { findPlanDetail, updatePlan } from '../../../../lib/server/repos/plans';
import { PlanInstalledSchema, planDetailJson } from '../../../../lib/schemas/plans';
import { syncInstallReadings } from '../../../../lib/server/repos/install-feedback';
import { IdParamSchema } from '../../../../lib/schemas/params';

// The installer on the roof marks the antenna up: one step of the plan's state machine
// (scheduled → installed), open to surveyors who may not otherwise edit plans. A stale
// row_version is a 409; a plan that is not scheduled is a 409 naming where it can go.
export const POST = handler(async ({ locals, params, request }) => {
  const actor = requirePermission(locals, MARK_INSTALLED_PERMISSIONS);
  const { id } = parseWith(IdParamSchema, params);
  const { rowVersion } = await parseBody(PlanInstalledSchema, request);
  await getDb().transaction(async (trx) => {
    await updatePlan(trx, id, { state: 'installed', rowVersion }, actor.id);
    await syncInstallReadings(trx, id);
  });
  return json(planDetailJson(await findPlanDetail(getDb(), id)));
});
