// The review queue and reviewers' decisions on sightings.
import { get, request, seg, withQuery, type QueryOf } from './api';
import type { DecisionBody, DecisionResultJson, ReviewQueueJson, ReviewQueueQuerySchema } from '../schemas/review';

export const reviewApi = {
  queue: (page: QueryOf<typeof ReviewQueueQuerySchema> = {}) => get<ReviewQueueJson>(withQuery('/api/review/sightings', page)),
  decide: (sightingId: string, body: DecisionBody) => request<DecisionResultJson>('POST', `/api/sightings/${seg(sightingId)}/decision`, body),
};
