import { z } from 'zod';
import { ROLES, type Role } from '../domain/roles';
import { defineRecord, field, type JsonOf, type ValueOf } from './record';
import { enumOf } from './params';
import { PASSWORD_MIN_LENGTH } from '../domain/password-rules';

export const RoleSchema = enumOf(ROLES);

export const PASSWORD_MIN = PASSWORD_MIN_LENGTH;

/** An invitation: the person chooses their own password from the link mailed to them. */
export const NewUserSchema = z.object({
  email: z.string().trim().min(1, 'Required').email('Enter a valid e-mail address').max(254),
  name: z.string().trim().min(1, 'Required').max(120),
  role: RoleSchema,
});
export type NewUserInput = z.infer<typeof NewUserSchema>;

export const UserChangeSchema = z
  .object({
    role: RoleSchema.optional(),
    name: z.string().trim().min(1, 'Required').max(120).optional(),
    disabled: z.boolean().optional(),
  })
  .refine((v) => v.role !== undefined || v.name !== undefined || v.disabled !== undefined, {
    message: 'Nothing to change',
  });
export type UserChangeInput = z.infer<typeof UserChangeSchema>;

/** A user as repos return it and the API answers it (the password hash never leaves the repo). */
export const USER = defineRecord({
  id: field.id(),
  email: field.value<string>(),
  name: field.value<string>(),
  role: field.value<Role>(),
  disabled_at: field.maybeTime(),
  created_at: field.time(),
});
export type User = ValueOf<typeof USER.fields>;
export type UserJson = JsonOf<typeof USER.fields>;
/** While an invited person has not chosen a password: whether the link still works. */
export type InviteState = 'pending' | 'expired' | null;
export type UserListItemJson = UserJson & { invite: InviteState };
export type InvitedUserJson = UserJson & { invite: 'pending'; mail_sent: boolean };

export const userJson = (u: User): UserJson => USER.toJson(u);
