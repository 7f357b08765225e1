import { getDb } from '../../../lib/server/db';
import { handler, json, parseBody, requirePermission } from '../../../lib/server/http';
import { createUser, listUsers } from '../../../lib/server/repos/users';
import { NewUserSchema } from '../../../lib/schemas/users';

export const GET = handler(async ({ locals }) => {
  requirePermission(locals, 'users:manage');
  const items = await listUsers(getDb());
  return json({ items, total: items.length });
});

export const POST = handler(async ({ locals, request }) => {
  const actor = requirePermission(locals, 'users:manage');
  const input = await parseBody(NewUserSchema, request);
  const user = await getDb().transaction((trx) => createUser(trx, input, actor.id));
  return json(user, 201);
});
