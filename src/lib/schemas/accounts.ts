// Accounts by e-mail: sign-up, confirming the address, asking for a reset and setting a
// password from a mailed link. Shared by the endpoints and the forms.
import { z } from 'zod';
import { passwordProblem } from '../domain/password-rules';
import type { TokenPurpose } from '../domain/account-tokens';

export const EmailSchema = z
  .string({ required_error: 'Enter your e-mail', invalid_type_error: 'Enter your e-mail' })
  .trim()
  .min(1, 'Enter your e-mail')
  .email('Enter a valid e-mail address')
  .max(254, 'At most 254 characters');

export const NewPasswordSchema = z
  .string({ required_error: 'Choose a password', invalid_type_error: 'Choose a password' })
  .max(200, 'At most 200 characters')
  // Length (at least PASSWORD_MIN of users.ts), blank padding and the commonest choices.
  .superRefine((p, ctx) => {
    const problem = passwordProblem(p);
    if (problem) ctx.addIssue({ code: 'custom', message: problem });
  });

/** The token of a mailed link: 32 random bytes in base64url. */
export const TokenSchema = z
  .string({ required_error: 'The link has no token', invalid_type_error: 'The link has no token' })
  .trim()
  .regex(/^[A-Za-z0-9_-]{20,100}$/, 'This link is not valid. Check that the whole address was copied, or ask for a new one.');

export const SignupSchema = z.object({
  name: z.string({ required_error: 'Enter your name' }).trim().min(1, 'Enter your name').max(120, 'At most 120 characters'),
  email: EmailSchema,
  password: NewPasswordSchema,
});
export type SignupInput = z.infer<typeof SignupSchema>;

export const ForgotSchema = z.object({ email: EmailSchema });

export const VerifySchema = z.object({ token: TokenSchema });

export const SetPasswordSchema = z.object({ token: TokenSchema, password: NewPasswordSchema });

export const TokenQuerySchema = z.object({ token: TokenSchema });

/** The same answer whether or not the e-mail belongs to an account. */
export interface AccountRequestJson {
  ok: true;
  message: string;
}

/** What a link is for, to word the page that follows it. */
export interface TokenInfoJson {
  purpose: TokenPurpose;
  email: string;
  name: string | null;
}

export interface SignedInJson {
  user: { id: string; email: string; name: string; role: string };
}
