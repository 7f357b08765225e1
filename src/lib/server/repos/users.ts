import type { Tx } from '../db';
import type { Role } from '../../domain/roles';
import { ConflictError, NotFoundError, ValidationError } from '../errors';
import { hashPassword } from '../password';
import { recordAudit } from './audit';
import { USER, type User } from '../../schemas/users';

export type { User };

interface UserRow {
  id: string;
  email: string;
  name: string;
  role: Role;
  password_hash: string;
  disabled_at: Date | null;
  created_at: Date;
}

export const toUser = (row: UserRow): User => USER.fromRow(row as unknown as Record<string, unknown>);

export async function findUserForLogin(db: Tx, email: string): Promise<(User & { passwordHash: string }) | null> {
  const row = await db<UserRow>('users').whereRaw('lower(email) = lower(?)', [email]).first();
  return row ? { ...toUser(row), passwordHash: row.password_hash } : null;
}

export async function findUser(db: Tx, id: string): Promise<User> {
  const row = await db<UserRow>('users').where({ id }).first();
  if (!row) throw new NotFoundError('User not found');
  return toUser(row);
}

export async function listUsers(db: Tx): Promise<User[]> {
  const rows = await db<UserRow>('users').orderBy('name');
  return rows.map(toUser);
}

export interface NewUser {
  email: string;
  name: string;
  role: Role;
  password: string;
}

export async function createUser(db: Tx, input: NewUser, actorId: string | null): Promise<User> {
  const { password, ...rest } = input;
  return createUserWithHash(db, { ...rest, passwordHash: await hashPassword(password) }, actorId);
}

export interface NewUserWithHash {
  email: string;
  name: string;
  role: Role;
  passwordHash: string;
}

/** Creates a user whose password is already hashed (a confirmed sign-up, an invitation). */
export async function createUserWithHash(db: Tx, input: NewUserWithHash, actorId: string | null, via?: 'signup' | 'invite'): Promise<User> {
  const exists = await db('users').whereRaw('lower(email) = lower(?)', [input.email]).first('id');
  if (exists) throw new ConflictError(`A user with e-mail ${input.email} already exists`);
  const [row] = await db<UserRow>('users')
    .insert({
      email: input.email.trim(),
      name: input.name.trim(),
      role: input.role,
      password_hash: input.passwordHash,
    })
    .returning('*');
  const user = toUser(row);
  await recordAudit(db, {
    userId: actorId ?? (via === 'signup' ? user.id : null),
    action: 'create',
    entity: 'user',
    entityId: user.id,
    after: via ? { ...auditView(user), via } : auditView(user),
  });
  return user;
}

/** Replaces the password and ends every session of the user, audited. */
export async function setUserPassword(db: Tx, id: string, passwordHash: string, via: 'reset' | 'invite'): Promise<void> {
  const updated = await db('users').where({ id }).update({ password_hash: passwordHash });
  if (!updated) throw new NotFoundError('User not found');
  await db('sessions').where({ user_id: id }).delete();
  await recordAudit(db, { userId: id, action: 'set_password', entity: 'user', entityId: id, after: { via } });
}

export interface UserChange {
  role?: Role;
  disabled?: boolean;
  name?: string;
}

export async function updateUser(db: Tx, id: string, change: UserChange, actorId: string): Promise<User> {
  const before = await findUser(db, id);
  if (change.disabled === true && id === actorId) {
    throw new ValidationError('You cannot disable your own account', { disabled: ['You cannot disable yourself'] });
  }
  if (change.role && change.role !== 'admin' && id === actorId && before.role === 'admin') {
    throw new ValidationError('You cannot remove your own admin role', { role: ['Ask another admin to change your role'] });
  }
  const patch: Partial<UserRow> = {};
  if (change.role) patch.role = change.role;
  if (change.name) patch.name = change.name.trim();
  if (change.disabled !== undefined) patch.disabled_at = change.disabled ? (before.disabledAt ?? new Date()) : null;
  const [row] = await db<UserRow>('users').where({ id }).update(patch).returning('*');
  const after = toUser(row);
  if (change.disabled) await db('sessions').where({ user_id: id }).delete();
  await recordAudit(db, { userId: actorId, action: 'update', entity: 'user', entityId: id, before: auditView(before), after: auditView(after) });
  return after;
}

function auditView(u: User) {
  return { email: u.email, name: u.name, role: u.role, disabled: u.disabledAt !== null };
}
