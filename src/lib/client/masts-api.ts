// Masts and their cells, the basemap style and the map's search box.
import type { z } from 'zod';
import { get, request, seg, withQuery, type List } from './api';
import type { CellChangeSchema, CellInputSchema, CellJson, MastChangeSchema, MastInputSchema, MastJson } from '../schemas/masts';
import type { MastDetailJson, MastFeatureCollectionJson, SearchHitJson } from '../schemas/mast-responses';

export type MastBody = z.input<typeof MastInputSchema>;
export type CellBody = z.input<typeof CellInputSchema>;

export const mastsApi = {
  list: (filter: { bbox?: string; operator?: string[]; band?: string[]; tech?: string[]; status?: string[]; limit?: number } = {}) =>
    get<MastFeatureCollectionJson>(withQuery('/api/masts', filter)),
  get: (id: string) => get<MastDetailJson>(`/api/masts/${seg(id)}`),
  /** A new mast; answers 201 with the mast. */
  create: (body: MastBody) => request<MastJson>('POST', '/api/masts', body),
  /** Partial change; `row_version` must be the one last read, or the answer is 409 (CONFLICT). */
  update: (id: string, change: z.input<typeof MastChangeSchema>) => request<MastJson>('PATCH', `/api/masts/${seg(id)}`, change),
};

export const cellsApi = {
  /** A new cell on a mast (the channel must lie in the band). */
  create: (mastId: string, body: CellBody) => request<CellJson>('POST', `/api/masts/${seg(mastId)}/cells`, body),
  /** Partial change, checked again as a whole; a stale `row_version` is refused with 409. */
  update: (id: string, change: z.input<typeof CellChangeSchema>) => request<CellJson>('PATCH', `/api/cells/${seg(id)}`, change),
  /** Refused with 409 while a plan has chosen the cell. */
  remove: (id: string) => request<void>('DELETE', `/api/cells/${seg(id)}`),
};

export const mapApi = {
  /** The basemap style (MapLibre style JSON) with absolute tile URLs. */
  style: <Style>() => get<Style>('/api/map/style.json'),
  search: (q: string, limit = 8) => get<List<SearchHitJson>>(withQuery('/api/search', { q, limit })),
};
