// Accounts by e-mail: sign-up, confirming an address, password reset.
import { request } from './api';
import type { AccountRequestJson, SignedInJson } from '../schemas/accounts';

export const accountsApi = {
  signup: (input: { name: string; email: string; password: string }) => request<AccountRequestJson>('POST', '/api/auth/signup', input),
  verify: (token: string) => request<SignedInJson>('POST', '/api/auth/verify', { token }),
  forgot: (email: string) => request<AccountRequestJson>('POST', '/api/auth/forgot', { email }),
  setPassword: (token: string, password: string) => request<SignedInJson>('POST', '/api/auth/reset', { token, password }),
};
