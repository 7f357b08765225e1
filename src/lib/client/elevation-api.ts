// Elevation grids (admin uploads) and a height at a point.
import { get, request, seg, uploadFile, withQuery, type List, type UploadProgress } from './api';
import type { ElevationGridJson, ElevationSampleJson } from '../schemas/elevation';

export const elevationApi = {
  list: () => get<List<ElevationGridJson>>('/api/elevation'),
  upload: (file: File, onProgress?: (p: UploadProgress) => void, signal?: AbortSignal) =>
    uploadFile<ElevationGridJson>('/api/elevation', file, { onProgress, signal, failed: 'Upload failed' }),
  remove: (id: string) => request<void>('DELETE', `/api/elevation/${seg(id)}`),
  sample: (lat: number, lon: number) => get<ElevationSampleJson>(withQuery('/api/elevation/sample', { lat, lon })),
};
