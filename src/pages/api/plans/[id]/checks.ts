import { getDb } from '../../../../lib/server/db';
import { handler, json, parseBody, parseWith, requireUser } from '../../../../lib/server/http';
import { ForbiddenError } from '../../../../lib/server/errors';
import { canRecordChecks, canViewPlans } from '../../../../lib/domain/plan-state';
import { addInstallCheck, findPlan, installCheckJson, listInstallChecks } from '../../../../lib/server/repos/plans';
import { InstallCheckInputSchema } from '../../../../lib/schemas/plans';
import { syncInstallReadings } from '../../../../lib/server/repos/install-feedback';
import { IdParamSchema } from '../../../../lib/schemas/params';

export const GET = handler(async ({ locals, params }) => {
  if (!canViewPlans(requireUser(locals).role)) throw new ForbiddenError();
  const { id } = parseWith(IdParamSchema, params);
  const db = getDb();
  await findPlan(db, id);
  const items = (await listInstallChecks(db, id)).map(installCheckJson);
  return json({ items, total: items.length });
});

// Before/after readings per PCI and speed tests, recorded by planners or surveyors at the install.
export const POST = handler(async ({ locals, params, request }) => {
  const actor = requireUser(locals);
  if (!canRecordChecks(actor.role)) throw new ForbiddenError();
  const { id } = parseWith(IdParamSchema, params);
  const input = await parseBody(InstallCheckInputSchema, request);
  const check = await getDb().transaction(async (trx) => {
    const added = await addInstallCheck(trx, id, input, actor.id, new Date());
    await syncInstallReadings(trx, id);
    return added;
  });
  return json(installCheckJson(check), 201);
});
