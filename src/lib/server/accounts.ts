// Accounts by e-mail: contributor sign-up with a confirmation link, password reset, and
// invitations from an admin. Links are single-use tokens (repos/account-tokens.ts). Answers to
// sign-up and reset requests never tell whether an address has an account.
import { randomBytes } from 'node:crypto';
import type { Knex } from 'knex';
import type { Role } from '../domain/roles';
import { config } from './config';
import { ConflictError, ForbiddenError } from './errors';
import { sendMail, type OutgoingMail } from './mail';
import { hashPassword } from './password';
import { recordAccountRequest } from './account-throttle';
import { existingAccountMail, inviteMail, resetMail, signupMail } from './account-mail';
import { consumeToken, issueToken, listOpenInvites, peekToken, retireUserTokens, type AccountToken } from './repos/account-tokens';
import { createUserWithHash, findUser, findUserForLogin, setUserPassword, type User } from './repos/users';
import { recordAudit } from './repos/audit';
import { type TOKEN_PROBLEM, tokenState, type TokenPurpose } from '../domain/account-tokens';
import { TokenSchema } from '../schemas/accounts';

export const SIGNUP_ANSWER =
  'Thank you. We have sent a message to that address: follow its link within 24 hours to confirm it. Nothing arrived? Look in the spam folder.';
export const RESET_ANSWER = 'If an account uses that address, a message with a link to choose a new password is on its way. The link works for one hour.';

/** Where mailed links point: PUBLIC_ORIGIN when set (never trust the Host header in production), else this request's origin. */
export function linkOrigin(url: URL): string {
  return (config.publicOrigin ?? url.origin).replace(/\/+$/, '');
}

/**
 * Sends without making the request wait, so an answer takes as long whether or not a message
 * went out. A failure is logged; the person can ask again.
 */
function deliverLater(mail: OutgoingMail): void {
  sendMail(mail).catch((err) => console.error('[bearline] account mail not sent', err instanceof Error ? err.message : err));
}

export async function requestSignup(db: Knex, input: { name: string; email: string; password: string }, ip: string, origin: string): Promise<void> {
  await recordAccountRequest(db, 'signup', input.email, ip);
  // Hashed in both cases so the answer takes as long whether or not the address is known.
  const passwordHash = await hashPassword(input.password);
  const existing = await findUserForLogin(db, input.email);
  if (existing) {
    deliverLater(existingAccountMail(existing.email, existing.name, `${origin}/login`, `${origin}/forgot`));
    return;
  }
  const { token } = await issueToken(db, { purpose: 'signup', email: input.email.trim(), name: input.name.trim(), passwordHash });
  deliverLater(signupMail(input.email.trim(), input.name.trim(), `${origin}/verify?token=${token}`));
}

/** Follows a sign-up link: creates the contributor account (once) and returns it. */
export async function confirmSignup(db: Knex, token: string): Promise<User> {
  return db.transaction(async (trx) => {
    const link = await consumeToken(trx, token, ['signup']);
    if (await findUserForLogin(trx, link.email)) {
      throw new ConflictError('An account with this e-mail already exists. Sign in, or ask for a new password.');
    }
    const user = await createUserWithHash(trx, { email: link.email, name: link.name!, role: 'contributor', passwordHash: link.passwordHash! }, null, 'signup');
    // Other sign-up links for the same address can no longer make a second account.
    await trx('account_tokens')
      .where({ purpose: 'signup' })
      .whereRaw('lower(email) = lower(?)', [link.email])
      .whereNull('used_at')
      .update({ used_at: new Date() });
    return user;
  });
}

export async function requestPasswordReset(db: Knex, email: string, ip: string, origin: string): Promise<void> {
  await recordAccountRequest(db, 'reset', email, ip);
  const user = await findUserForLogin(db, email);
  if (!user || user.disabledAt) return;
  const { token } = await issueToken(db, { purpose: 'reset', email: user.email, userId: user.id });
  deliverLater(resetMail(user.email, user.name, `${origin}/reset?token=${token}`));
}

export type LinkCheck = { link: AccountToken; problem?: never } | { link?: never; problem: keyof typeof TOKEN_PROBLEM };

/** What a link is for, to word the page it opens, or why it cannot be used. Does not use it up. */
export async function checkLink(db: Knex, token: string | null, purposes: readonly TokenPurpose[]): Promise<LinkCheck> {
  const parsed = TokenSchema.safeParse(token ?? '');
  if (!parsed.success) return { problem: 'unknown' };
  const link = await peekToken(db, parsed.data, purposes);
  if (!link) return { problem: 'unknown' };
  const state = tokenState(link, new Date());
  return state === 'usable' ? { link } : { problem: state };
}

/** Follows a reset or invitation link: sets the password, ends every session, retires the user's other links. */
export async function setPasswordFromLink(db: Knex, token: string, password: string): Promise<{ user: User; purpose: TokenPurpose }> {
  const passwordHash = await hashPassword(password);
  return db.transaction(async (trx) => {
    const link = await consumeToken(trx, token, ['reset', 'invite']);
    const user = await findUser(trx, link.userId!);
    if (user.disabledAt) throw new ForbiddenError('This account is disabled. Ask an admin to enable it.');
    await setUserPassword(trx, user.id, passwordHash, link.purpose === 'invite' ? 'invite' : 'reset');
    await retireUserTokens(trx, user.id, ['reset', 'invite']);
    return { user, purpose: link.purpose };
  });
}

async function unusablePasswordHash(): Promise<string> {
  // Nobody knows this password; the account is usable once the invitation link sets one.
  return hashPassword(randomBytes(32).toString('base64url'));
}

export interface InviteResult {
  user: User;
  mailSent: boolean;
}

async function mailInvite(user: User, invitedBy: string, token: string, origin: string): Promise<boolean> {
  try {
    await sendMail(inviteMail(user.email, user.name, user.role, invitedBy, `${origin}/reset?token=${token}`));
    return true;
  } catch (err) {
    console.error('[bearline] invitation not mailed', err instanceof Error ? err.message : err);
    return false;
  }
}

/** An invitation link for `user`, audited as the actor's invite (`extra` adds to the entry); returns the token to mail. */
async function issueInvite(trx: Knex.Transaction, user: User, actorId: string, extra: { resent?: true }): Promise<string> {
  const issued = await issueToken(trx, { purpose: 'invite', email: user.email, userId: user.id, createdBy: actorId });
  await recordAudit(trx, {
    userId: actorId,
    action: 'invite',
    entity: 'user',
    entityId: user.id,
    after: { expires_at: issued.record.expiresAt.toISOString(), ...extra },
  });
  return issued.token;
}

/** An admin makes an account and mails its owner a link to choose the password. */
export async function inviteUser(
  db: Knex,
  input: { email: string; name: string; role: Role },
  actor: { id: string; name: string },
  origin: string,
): Promise<InviteResult> {
  const passwordHash = await unusablePasswordHash();
  const { user, token } = await db.transaction(async (trx) => {
    const created = await createUserWithHash(trx, { ...input, passwordHash }, actor.id, 'invite');
    return { user: created, token: await issueInvite(trx, created, actor.id, {}) };
  });
  return { user, mailSent: await mailInvite(user, actor.name, token, origin) };
}

/** A new invitation link for someone who has not chosen a password yet; older links stop working. */
export async function resendInvite(db: Knex, userId: string, actor: { id: string; name: string }, origin: string): Promise<InviteResult> {
  const { user, token } = await db.transaction(async (trx) => {
    const target = await findUser(trx, userId);
    if (!(await listOpenInvites(trx)).has(target.id)) {
      throw new ConflictError(`${target.name} has already chosen a password. They can use "Forgotten your password?" on the sign-in page.`);
    }
    if (target.disabledAt) throw new ConflictError(`${target.name} is disabled. Enable the account first.`);
    await retireUserTokens(trx, target.id, ['invite']);
    return { user: target, token: await issueInvite(trx, target, actor.id, { resent: true }) };
  });
  return { user, mailSent: await mailInvite(user, actor.name, token, origin) };
}
