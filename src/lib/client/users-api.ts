// Users (admin): the list, invitations and changes.
import type { z } from 'zod';
import { get, request, seg, type List } from './api';
import type { InvitedUserJson, NewUserSchema, UserChangeSchema, UserListItemJson } from '../schemas/users';

export const usersApi = {
  list: () => get<List<UserListItemJson>>('/api/users'),
  /** Makes the account and mails the person a link to choose their password. */
  invite: (body: z.input<typeof NewUserSchema>) => request<InvitedUserJson>('POST', '/api/users', body),
  resendInvite: (id: string) => request<InvitedUserJson>('POST', `/api/users/${seg(id)}/invite`),
  update: (id: string, change: z.input<typeof UserChangeSchema>) => request<UserListItemJson>('PATCH', `/api/users/${seg(id)}`, change),
};
