// Single-use e-mail links (sign-up, reset, invitation), stored as SHA-256 hashes.
import type { Tx } from '../db';
import { TOKEN_PROBLEM, tokenExpiry, tokenState, type TokenPurpose } from '../../domain/account-tokens';
import { AppError } from '../errors';
import { hashToken, newToken } from '../tokens';

export interface AccountToken {
  id: string;
  purpose: TokenPurpose;
  userId: string | null;
  email: string;
  name: string | null;
  passwordHash: string | null;
  createdAt: Date;
  expiresAt: Date;
  usedAt: Date | null;
}

interface TokenRow {
  id: string;
  purpose: TokenPurpose;
  token_hash: string;
  user_id: string | null;
  email: string;
  name: string | null;
  password_hash: string | null;
  created_by: string | null;
  created_at: Date;
  expires_at: Date;
  used_at: Date | null;
}

function toToken(r: TokenRow): AccountToken {
  return {
    id: String(r.id),
    purpose: r.purpose,
    userId: r.user_id === null ? null : String(r.user_id),
    email: r.email,
    name: r.name,
    passwordHash: r.password_hash,
    createdAt: r.created_at,
    expiresAt: r.expires_at,
    usedAt: r.used_at,
  };
}

export interface NewAccountToken {
  purpose: TokenPurpose;
  email: string;
  userId?: string | null;
  name?: string | null;
  passwordHash?: string | null;
  createdBy?: string | null;
}

/** Stores a new link and returns the token to mail (the only time it exists in clear). */
export async function issueToken(db: Tx, input: NewAccountToken, now = new Date()): Promise<{ token: string; record: AccountToken }> {
  const { token, hash } = newToken();
  const [row] = await db<TokenRow>('account_tokens')
    .insert({
      purpose: input.purpose,
      token_hash: hash,
      user_id: input.userId ?? null,
      email: input.email,
      name: input.name ?? null,
      password_hash: input.passwordHash ?? null,
      created_by: input.createdBy ?? null,
      created_at: now,
      expires_at: tokenExpiry(input.purpose, now),
    })
    .returning('*');
  return { token, record: toToken(row) };
}

/** The link's record without using it (to word a page), or null when the token is unknown. */
export async function peekToken(db: Tx, token: string, purposes: readonly TokenPurpose[]): Promise<AccountToken | null> {
  const row = await db<TokenRow>('account_tokens')
    .where({ token_hash: hashToken(token) })
    .whereIn('purpose', purposes)
    .first();
  return row ? toToken(row) : null;
}

/** A link that cannot be used: 400 with one of the fixed explanations. */
export class TokenProblemError extends AppError {
  constructor(readonly reason: keyof typeof TOKEN_PROBLEM) {
    super('BAD_REQUEST', TOKEN_PROBLEM[reason], { token: [TOKEN_PROBLEM[reason]] });
  }
}

/**
 * Uses a link once: locks its row, checks it, and marks it used, inside the caller's
 * transaction. A second use, even at the same moment, finds it used.
 */
export async function consumeToken(trx: Tx, token: string, purposes: readonly TokenPurpose[], now = new Date()): Promise<AccountToken> {
  const row = await trx<TokenRow>('account_tokens')
    .where({ token_hash: hashToken(token) })
    .whereIn('purpose', purposes)
    .forUpdate()
    .first();
  if (!row) throw new TokenProblemError('unknown');
  const record = toToken(row);
  const state = tokenState(record, now);
  if (state !== 'usable') throw new TokenProblemError(state);
  await trx('account_tokens').where({ id: row.id }).update({ used_at: now });
  return { ...record, usedAt: now };
}

/** Retires a user's other open links of these kinds (after a password was set). */
export async function retireUserTokens(trx: Tx, userId: string, purposes: readonly TokenPurpose[], now = new Date()): Promise<void> {
  await trx('account_tokens').where({ user_id: userId }).whereIn('purpose', purposes).whereNull('used_at').update({ used_at: now });
}

export type InviteState = 'pending' | 'expired';

/** Users whose latest invitation has not been followed yet, with whether it still works. */
export async function listOpenInvites(db: Tx, now = new Date()): Promise<Map<string, InviteState>> {
  const rows: Array<{ user_id: string; expires_at: Date; used_at: Date | null }> = await db('account_tokens')
    .distinctOn('user_id')
    .select('user_id', 'expires_at', 'used_at')
    .where({ purpose: 'invite' })
    .orderBy([{ column: 'user_id' }, { column: 'created_at', order: 'desc' }, { column: 'id', order: 'desc' }]);
  const out = new Map<string, InviteState>();
  for (const r of rows) {
    if (r.used_at) continue;
    out.set(String(r.user_id), r.expires_at.getTime() > now.getTime() ? 'pending' : 'expired');
  }
  return out;
}
