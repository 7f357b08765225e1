// Plans: saving one (with a new customer in the same request), changes, install checks, installed.
import type { z } from 'zod';
import { get, request, seg, withQuery, type List, type QueryOf } from './api';
import type {
  InstallCheckInputSchema,
  InstallCheckJson,
  PlanChangeSchema,
  PlanDetailJson,
  PlanInputSchema,
  PlanInstalledSchema,
  PlanJson,
  PlanListQuerySchema,
} from '../schemas/plans';

export type InstallCheckBody = z.input<typeof InstallCheckInputSchema>;

export const plansApi = {
  list: (query: QueryOf<typeof PlanListQuerySchema> = {}) => get<List<PlanJson>>(withQuery('/api/plans', query)),
  get: (id: string) => get<PlanDetailJson>(`/api/plans/${seg(id)}`),
  /** A new plan; with `customer` instead of `customer_id`, a new customer saved in the same transaction. */
  create: (body: z.input<typeof PlanInputSchema>) => request<PlanJson>('POST', '/api/plans', body),
  update: (id: string, change: z.input<typeof PlanChangeSchema>) => request<PlanDetailJson>('PATCH', `/api/plans/${seg(id)}`, change),
  checks: (id: string) => get<List<InstallCheckJson>>(`/api/plans/${seg(id)}/checks`),
  addCheck: (id: string, body: InstallCheckBody) => request<InstallCheckJson>('POST', `/api/plans/${seg(id)}/checks`, body),
  /** Scheduled → installed, for planners and surveyors; 409 when the plan changed since `row_version`. */
  markInstalled: (id: string, body: z.input<typeof PlanInstalledSchema>) => request<PlanDetailJson>('POST', `/api/plans/${seg(id)}/installed`, body),
};
