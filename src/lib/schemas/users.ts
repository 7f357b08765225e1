import { z } from 'zod';
import { ROLES } from '../domain/roles';
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
