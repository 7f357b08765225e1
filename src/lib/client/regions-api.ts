// Regions (admin outlines; the map fits to them).
import type { z } from 'zod';
import { get, request, seg, withQuery, type List } from './api';
import type { RegionChangeSchema, RegionInputSchema, RegionJson } from '../schemas/regions';

export const regionsApi = {
  /** Outlines simplified to one pixel at `zoom` (never in full). */
  list: (zoom: number) => get<List<RegionJson>>(withQuery('/api/regions', { zoom })),
  create: (body: z.input<typeof RegionInputSchema>) => request<RegionJson>('POST', '/api/regions', body),
  update: (id: string, change: z.input<typeof RegionChangeSchema>) => request<RegionJson>('PATCH', `/api/regions/${seg(id)}`, change),
  remove: (id: string) => request<void>('DELETE', `/api/regions/${seg(id)}`),
};
