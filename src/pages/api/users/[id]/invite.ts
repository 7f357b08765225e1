import { getDb } from '../../../../lib/server/db';
import { handler, json, parseWith, requirePermission } from '../../../../lib/server/http';
import { resendInvite, linkOrigin } from '../../../../lib/server/accounts';
import { IdParamSchema } from '../../../../lib/schemas/params';
import { userJson, type InvitedUserJson } from '../../../../lib/schemas/users';

/** Mails a fresh invitation link (older ones stop working); 409 once the person has chosen a password. */
export const POST = handler(async ({ locals, params, url }) => {
  const actor = requirePermission(locals, 'users:manage');
  const { id } = parseWith(IdParamSchema, params);
  const { user, mailSent } = await resendInvite(getDb(), id, actor, linkOrigin(url));
  return json({ ...userJson(user), invite: 'pending', mail_sent: mailSent } satisfies InvitedUserJson);
});
