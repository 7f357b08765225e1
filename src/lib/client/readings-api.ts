// Survey-log uploads (with upload progress) and the background jobs they start.
import { get, seg, uploadFile, type UploadProgress } from './api';
import type { JobJson, ReadingsImportJson } from '../schemas/jobs';

export const readingsApi = {
  /** Sends the file as multipart; onProgress follows the bytes as they leave the browser. */
  importFile: (file: File, onProgress: (p: UploadProgress) => void) =>
    uploadFile<ReadingsImportJson>('/api/readings/import', file, { onProgress, failed: 'Import failed' }),
};

export const jobsApi = {
  get: (id: string) => get<JobJson>(`/api/jobs/${seg(id)}`),
};
