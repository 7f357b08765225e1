// Elevation data endpoints for the islands.
import { ApiError, get, networkError, request, toApiError, type ErrorBody, type List } from './api';
import type { ElevationGridJson, ElevationSampleJson } from '../schemas/elevation';

export type { ElevationGridJson, ElevationSampleJson };

export interface UploadProgress {
  loaded: number;
  total: number;
}

/**
 * Uploads a file as multipart form data. XMLHttpRequest rather than fetch because only it reports
 * upload progress in browsers.
 */
function uploadFile<T>(url: string, file: File, onProgress?: (p: UploadProgress) => void, signal?: AbortSignal): Promise<T> {
  return new Promise<T>((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open('POST', url);
    xhr.setRequestHeader('Accept', 'application/json');
    xhr.withCredentials = true;
    xhr.upload.onprogress = (e) => {
      if (e.lengthComputable) onProgress?.({ loaded: e.loaded, total: e.total });
    };
    xhr.onload = () => {
      let data: ErrorBody = null;
      try {
        data = xhr.responseText ? JSON.parse(xhr.responseText) : null;
      } catch {
        data = null;
      }
      if (xhr.status >= 200 && xhr.status < 300) return resolve(data as T);
      reject(toApiError(xhr.status, data, 'Upload failed'));
    };
    xhr.onerror = () => reject(networkError());
    xhr.onabort = () => reject(new ApiError(0, 'ABORTED', 'Upload cancelled'));
    signal?.addEventListener('abort', () => xhr.abort(), { once: true });
    const form = new FormData();
    form.set('file', file);
    xhr.send(form);
  });
}

export const elevationApi = {
  list: () => get<List<ElevationGridJson>>('/api/elevation'),
  upload: (file: File, onProgress?: (p: UploadProgress) => void, signal?: AbortSignal) =>
    uploadFile<ElevationGridJson>('/api/elevation', file, onProgress, signal),
  remove: (id: string) => request<void>('DELETE', `/api/elevation/${id}`),
  sample: (lat: number, lon: number) => get<ElevationSampleJson>(`/api/elevation/sample?${new URLSearchParams({ lat: String(lat), lon: String(lon) })}`),
};
