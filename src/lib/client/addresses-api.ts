// The gazetteer: its pages, CSV imports, and geocoding (an address or typed coordinates → a position).
import { get, postForm, withQuery, type List, type QueryOf } from './api';
import type { AddressImportJson, AddressJson, AddressListQuerySchema, GeocodeMatchJson, GeocodeQuerySchema } from '../schemas/addresses';

export const addressesApi = {
  /** A page of the gazetteer: `after` is the previous page's `next` (keyset paging). */
  list: (query: QueryOf<typeof AddressListQuerySchema> = {}) =>
    get<List<AddressJson> & { total_exact: boolean; next: string | null }>(withQuery('/api/addresses', query)),
  /** Uploads a CSV file as multipart (field `file`); the error body lists bad rows by line. */
  importFile: async (file: File) => {
    const form = new FormData();
    form.append('file', file);
    return (await postForm<AddressImportJson>('/api/addresses/import', form, 'Upload failed')).data;
  },
  geocode: (query: QueryOf<typeof GeocodeQuerySchema>) => get<List<GeocodeMatchJson>>(withQuery('/api/geocode', { limit: 8, ...query })),
};
