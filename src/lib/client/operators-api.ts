// Operators: the one list every island chooses from, and the admin's changes.
import type { z } from 'zod';
import { get, request, seg, type List } from './api';
import type { OperatorChangeSchema, OperatorInputSchema, OperatorJson } from '../schemas/operators';

export const operatorsApi = {
  list: () => get<List<OperatorJson>>('/api/operators'),
  create: (body: z.input<typeof OperatorInputSchema>) => request<OperatorJson>('POST', '/api/operators', body),
  update: (id: string, change: z.input<typeof OperatorChangeSchema>) => request<OperatorJson>('PATCH', `/api/operators/${seg(id)}`, change),
};
