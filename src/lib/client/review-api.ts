// The review queue and reviewers' decisions.
import { get, queryString, request } from './api';
import type { DecisionBody, DecisionResultJson, ReviewQueueJson } from '../schemas/review';

export type { DecisionBody, DecisionResultJson, ReviewQueueJson };
export type { ReviewItemJson, DuplicateCandidateJson, SubmitterRecordJson } from '../schemas/review';

export const reviewApi = {
  queue: (page: { limit?: number; offset?: number } = {}) => get<ReviewQueueJson>(`/api/review/sightings?${queryString(page)}`),
  decide: (sightingId: string, body: DecisionBody) => request<DecisionResultJson>('POST', `/api/sightings/${encodeURIComponent(sightingId)}/decision`, body),
};
