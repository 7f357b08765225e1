// Accounts by e-mail: sign-up, confirming an address, password reset.
import type { z } from 'zod';
import { request } from './api';
import type { AccountRequestJson, ForgotSchema, SetPasswordSchema, SignedInJson, SignupSchema, VerifySchema } from '../schemas/accounts';

export const accountsApi = {
  signup: (body: z.input<typeof SignupSchema>) => request<AccountRequestJson>('POST', '/api/auth/signup', body),
  verify: (body: z.input<typeof VerifySchema>) => request<SignedInJson>('POST', '/api/auth/verify', body),
  forgot: (body: z.input<typeof ForgotSchema>) => request<AccountRequestJson>('POST', '/api/auth/forgot', body),
  setPassword: (body: z.input<typeof SetPasswordSchema>) => request<SignedInJson>('POST', '/api/auth/reset', body),
};
