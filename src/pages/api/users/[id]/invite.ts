import { getDb } from '../../../../lib/server/db';
import { handler, json, parseWith, requirePermission } from '../../../../lib/server/http';
import { resendInvite, linkOrigin } from '../../../../lib/server/accounts';
import { IdParamSchema } from '../../../../lib/schemas/params';

/** Mails a fresh invitation link (older ones stop working); 409 once the person has chosen a password. */
export const POST = handler(async ({ locals, params, url }) => {
  const actor = requirePermission(locals, 'users:manage');
  const { id } = parseWith(IdParamSchema, params);
  const { user, mailSent } = await resendInvite(getDb(), id, actor, linkOrigin(url));
  return json({ ...user, invite: 'pending', mailSent });
});
