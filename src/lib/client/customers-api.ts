// Customers: the list, one customer, changes, history and erasure.
import type { z } from 'zod';
import { get, request, seg, withQuery, type List, type QueryOf } from './api';
import type {
  CustomerChangeSchema,
  CustomerErasureJson,
  CustomerInputSchema,
  CustomerJson,
  CustomerListQuerySchema,
  HistoryEntryJson,
} from '../schemas/customers';

export type CustomerBody = z.input<typeof CustomerInputSchema>;
export type CustomerChangeBody = z.input<typeof CustomerChangeSchema>;

export const customersApi = {
  list: (query: QueryOf<typeof CustomerListQuerySchema> = {}) => get<List<CustomerJson>>(withQuery('/api/customers', query)),
  get: (id: string) => get<CustomerJson>(`/api/customers/${seg(id)}`),
  create: (body: CustomerBody) => request<CustomerJson>('POST', '/api/customers', body),
  update: (id: string, change: CustomerChangeBody) => request<CustomerJson>('PATCH', `/api/customers/${seg(id)}`, change),
  history: (id: string) => get<List<HistoryEntryJson>>(`/api/customers/${seg(id)}/history`),
  /** Erases the customer's personal data on their request (planner/admin). */
  erase: (id: string) => request<CustomerErasureJson>('POST', `/api/customers/${seg(id)}/erasure`),
};
