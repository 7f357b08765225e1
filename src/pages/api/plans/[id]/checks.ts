import { getDb } from '../../../../lib/server/db';
import { handler, json, parseBody, parseWith, requirePermission } from '../../../../lib/server/http';
import { RECORD_CHECKS_PERMISSIONS } from '../../../../lib/domain/plan-state';
import { addInstallCheck, findPlan, listInstallChecks } from '../../../../lib/server/repos/plans';
import { InstallCheckInputSchema, installCheckJson } from '../../../../lib/schemas/plans';
import { syncInstallReadings } from '../../../../lib/server/repos/install-feedback';
import { IdParamSchema } from '../../../../lib/schemas/params';

export const GET = handler(async ({ locals, params }) => {
  requirePermission(locals, 'plans:view');
  const { id } = parseWith(IdParamSchema, params);
  const db = getDb();
  await findPlan(db, id);
  const items = (await listInstallChecks(db, id)).map(installCheckJson);
  return json({ items, total: items.length });
});

// Before/after readings per PCI and speed tests, recorded by planners or surveyors at the install.
export const POST = handler(async ({ locals, params, request }) => {
  const actor = requirePermission(locals, RECORD_CHECKS_PERMISSIONS);
  const { id } = parseWith(IdParamSchema, params);
  const input = await parseBody(InstallCheckInputSchema, request);
  const check = await getDb().transaction(async (trx) => {
    const added = await addInstallCheck(trx, id, input, actor.id, new Date());
    await syncInstallReadings(trx, id);
    return added;
  });
  return json(installCheckJson(check), 201);
});
