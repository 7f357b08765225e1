// The planner's ranked candidate cells for a position and a kit.
import { get, withQuery, type QueryOf } from './api';
import type { ShortlistJson, ShortlistQuerySchema } from '../schemas/shortlist';

export const shortlistApi = {
  get: (query: QueryOf<typeof ShortlistQuerySchema>) => get<ShortlistJson>(withQuery('/api/shortlist', query)),
};
