// Sightings from the islands: sending one (multipart) and listing one's own.
import { ApiError, get, networkError, toApiError } from './api';
import type { MastSurveyJson, PendingSightingCollectionJson, SightingCreatedJson, SightingInputJson, SightingListJson } from '../schemas/sightings';

export interface PhotoFile {
  name: string;
  blob: Blob;
}

/** Sends one sighting; `created` is false when the server already had it (a retry). */
export async function sendSighting(sighting: SightingInputJson, photos: PhotoFile[]): Promise<SightingCreatedJson & { created: boolean }> {
  const form = new FormData();
  form.append('sighting', JSON.stringify(sighting));
  for (const p of photos) form.append('photo', p.blob, p.name);
  let res: Response;
  try {
    res = await fetch('/api/sightings', { method: 'POST', body: form, credentials: 'same-origin', headers: { Accept: 'application/json' } });
  } catch {
    throw networkError();
  }
  const data = await res.json().catch(() => null);
  if (!res.ok) throw toApiError(res.status, data, 'Sending the sighting failed');
  if (!data || typeof data.id !== 'string') throw new ApiError(res.status, 'UNKNOWN', 'The server answered without the sighting');
  return { ...(data as SightingCreatedJson), created: res.status === 201 };
}

export const sightingsApi = {
  mine: () => get<SightingListJson>('/api/sightings?mine=1&limit=200'),
  /** Pending sightings the caller may see (all for reviewers and admins, else their own). */
  pending: () => get<PendingSightingCollectionJson>('/api/sightings/pending'),
  mastSurveys: (mastId: string) => get<MastSurveyJson>(`/api/masts/${mastId}/surveys`),
};
