import { getDb } from '../../../lib/server/db';
import { handler, json, parseBody, parseQuery, parseWith, requirePermission } from '../../../lib/server/http';
import { deleteMast, findMast, updateMast } from '../../../lib/server/repos/masts';
import { mastDetailJson, mastJson } from '../../../lib/schemas/mast-responses';
import { MastChangeSchema } from '../../../lib/schemas/masts';
import { MastDeleteQuerySchema } from '../../../lib/schemas/mast-query';
import { IdParamSchema } from '../../../lib/schemas/params';
import { can } from '../../../lib/domain/roles';

/** The mast with its cells (and operators) and up to 20 recent readings matched to them (install-check
 * readings, taken at customers' homes, only for roles that may see customers). */
export const GET = handler(async ({ locals, params }) => {
  const user = requirePermission(locals, 'map:view');
  const { id } = parseWith(IdParamSchema, params);
  return json(mastDetailJson(await findMast(getDb(), id, { withInstallReadings: can(user.role, 'plans:view') })));
});

/** Partial update; `row_version` must match the stored one or the answer is 409. */
export const PATCH = handler(async ({ locals, params, request }) => {
  const actor = requirePermission(locals, 'masts:write');
  const { id } = parseWith(IdParamSchema, params);
  const change = await parseBody(MastChangeSchema, request);
  const mast = await getDb().transaction((trx) => updateMast(trx, id, change, actor.id));
  return json(mastJson(mast));
});

/** Deletes the mast and its cells (409 while plans use a cell: decommission it instead), unlinking and
 * auditing their readings; `?row_version=` makes it conditional (409 when stale). */
export const DELETE = handler(async ({ locals, params, url }) => {
  const actor = requirePermission(locals, 'masts:write');
  const { id } = parseWith(IdParamSchema, params);
  const { row_version } = parseQuery(MastDeleteQuerySchema, url);
  await getDb().transaction((trx) => deleteMast(trx, id, row_version, actor.id));
  return new Response(null, { status: 204 });
});
