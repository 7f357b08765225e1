// Sightings: sending one (multipart, with photos), one's own, the pending ones, a mast's surveys.
import { ApiError, get, postForm, seg, withQuery } from './api';
import type { MastSurveyJson, PendingSightingCollectionJson, SightingCreatedJson, SightingInputJson, SightingListJson } from '../schemas/sightings';

export interface PhotoFile {
  name: string;
  blob: Blob;
}

export const sightingsApi = {
  /** Sends one sighting; `created` is false when the server already had it (a retry). */
  async send(sighting: SightingInputJson, photos: PhotoFile[]): Promise<SightingCreatedJson & { created: boolean }> {
    const form = new FormData();
    form.append('sighting', JSON.stringify(sighting));
    for (const p of photos) form.append('photo', p.blob, p.name);
    const { data, status } = await postForm<SightingCreatedJson | null>('/api/sightings', form, 'Sending the sighting failed');
    if (!data || typeof data.id !== 'string') throw new ApiError(status, 'UNKNOWN', 'The server answered without the sighting');
    return { ...data, created: status === 201 };
  },
  mine: () => get<SightingListJson>(withQuery('/api/sightings', { mine: 1, limit: 200 })),
  /** Pending sightings the caller may see (all for reviewers and admins, else their own). */
  pending: () => get<PendingSightingCollectionJson>('/api/sightings/pending'),
  mastSurveys: (mastId: string) => get<MastSurveyJson>(`/api/masts/${seg(mastId)}/surveys`),
};
