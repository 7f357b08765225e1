import { getDb } from '../../../lib/server/db';
import { handler, json, parseBody, requirePermission } from '../../../lib/server/http';
import { listUsers } from '../../../lib/server/repos/users';
import { listOpenInvites } from '../../../lib/server/repos/account-tokens';
import { inviteUser, linkOrigin } from '../../../lib/server/accounts';
import { NewUserSchema, userJson, type InvitedUserJson, type UserListItemJson } from '../../../lib/schemas/users';

/** Every user, with `invite` = pending / expired while an invited person has not chosen a password. */
export const GET = handler(async ({ locals }) => {
  requirePermission(locals, 'users:manage');
  const [users, invites] = await Promise.all([listUsers(getDb()), listOpenInvites(getDb())]);
  const items = users.map((u): UserListItemJson => ({ ...userJson(u), invite: invites.get(u.id) ?? null }));
  return json({ items, total: items.length });
});

/** Invites a person: makes the account and mails them a link to choose their password. */
export const POST = handler(async ({ locals, request, url }) => {
  const actor = requirePermission(locals, 'users:manage');
  const input = await parseBody(NewUserSchema, request);
  const { user, mailSent } = await inviteUser(getDb(), input, actor, linkOrigin(url));
  return json({ ...userJson(user), invite: 'pending', mail_sent: mailSent } satisfies InvitedUserJson, 201);
});
