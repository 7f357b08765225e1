import { getDb } from '../../../lib/server/db';
import { handler, json, parseBody, parseWith, requirePermission } from '../../../lib/server/http';
import { findUser, updateUser } from '../../../lib/server/repos/users';
import { IdParamSchema } from '../../../lib/schemas/params';
import { UserChangeSchema, userJson } from '../../../lib/schemas/users';

export const GET = handler(async ({ locals, params }) => {
  requirePermission(locals, 'users:manage');
  const { id } = parseWith(IdParamSchema, params);
  return json(userJson(await findUser(getDb(), id)));
});

export const PATCH = handler(async ({ locals, params, request }) => {
  const actor = requirePermission(locals, 'users:manage');
  const { id } = parseWith(IdParamSchema, params);
  const change = await parseBody(UserChangeSchema, request);
  const user = await getDb().transaction((trx) => updateUser(trx, id, change, actor.id));
  return json(userJson(user));
});
