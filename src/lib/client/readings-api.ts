// Survey-log uploads (with upload progress, hence XMLHttpRequest) and the jobs they start.
import type { JobJson } from '../schemas/jobs';
import { ApiError, get, networkError, queryString, toApiError, type ErrorBody, type List } from './api';

export type { JobJson };

export interface ImportStarted {
  job_id: string;
  import_id: string;
  rows: number;
}

export const readingsApi = {
  /** Sends the file as multipart; onProgress gets 0–1 as the bytes leave the browser. */
  importFile(file: File, onProgress: (fraction: number) => void): Promise<ImportStarted> {
    return new Promise((resolve, reject) => {
      const xhr = new XMLHttpRequest();
      xhr.open('POST', '/api/readings/import');
      xhr.setRequestHeader('Accept', 'application/json');
      xhr.upload.onprogress = (e) => {
        if (e.lengthComputable) onProgress(e.loaded / e.total);
      };
      xhr.onerror = () => reject(networkError());
      xhr.onload = () => {
        let data: unknown = null;
        try {
          data = JSON.parse(xhr.responseText);
        } catch {
          data = null;
        }
        if (xhr.status >= 200 && xhr.status < 300) resolve(data as ImportStarted);
        else reject(toApiError(xhr.status, data as ErrorBody, 'Import failed'));
      };
      const form = new FormData();
      form.append('file', file);
      xhr.send(form);
    });
  },
};

export const jobsApi = {
  get: (id: string) => get<JobJson>(`/api/jobs/${encodeURIComponent(id)}`),
  list: (params: { limit?: number; offset?: number } = {}) => {
    const q = queryString(params);
    return get<List<JobJson>>(`/api/jobs${q ? `?${q}` : ''}`);
  },
};

export { ApiError };
