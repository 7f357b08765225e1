// The only place islands call fetch: requests, the error shape (ApiError), query strings, form
// uploads, and the browser-side form check. Each API resource has its own module beside this one
// (customers-api.ts, plans-api.ts, …); bodies are typed from the endpoint's schema (`z.input`),
// answers with the JSON types declared beside the schemas.
import type { z } from 'zod';

export type FieldErrors = Record<string, string[]>;

export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly fields: FieldErrors = {},
  ) {
    super(message);
  }
}

export type ErrorBody = { error?: { code?: string; message?: string; fields?: FieldErrors } } | null;

/** The ApiError for a failed answer, from its error body when it has one. */
export function toApiError(status: number, data: ErrorBody, failed: string): ApiError {
  const err = data?.error;
  return new ApiError(status, err?.code ?? 'UNKNOWN', err?.message ?? `${failed} (${status})`, err?.fields ?? {});
}

/** Any failure as an ApiError: an API answer as it is, anything else (a bug, a parse error) with the `failed` message. */
export function asApiError(e: unknown, failed: string): ApiError {
  return e instanceof ApiError ? e : new ApiError(0, 'UNKNOWN', failed);
}

/** The message for inputs a form's own check (`checkWith`) refused before anything was sent. */
export const LOCAL_CHECK_MESSAGE = 'Some fields need attention';

/** Field problems found in the browser, shaped like the server's 400 answer. */
export const localCheckError = (fields: FieldErrors, message = LOCAL_CHECK_MESSAGE) => new ApiError(400, 'BAD_REQUEST', message, fields);

/** Runs the endpoint's schema in the browser; returns field messages keyed like the server's. */
export function checkWith(
  schema: { safeParse: (v: unknown) => { success: true } | { success: false; error: { issues: { path: (string | number)[]; message: string }[] } } },
  body: unknown,
): FieldErrors | null {
  const result = schema.safeParse(body);
  if (result.success) return null;
  const fields: FieldErrors = {};
  for (const issue of result.error.issues) {
    const key = issue.path.length ? issue.path.join('.') : '_';
    (fields[key] ??= []).push(issue.message);
  }
  return fields;
}

export const networkError = () => new ApiError(0, 'NETWORK', 'The server could not be reached. Check your connection and try again.');

export async function request<T>(method: string, url: string, body?: unknown): Promise<T> {
  const init: RequestInit = { method, headers: { Accept: 'application/json' }, credentials: 'same-origin' };
  if (body !== undefined) {
    init.body = JSON.stringify(body);
    (init.headers as Record<string, string>)['Content-Type'] = 'application/json';
  }
  let res: Response;
  try {
    res = await fetch(url, init);
  } catch {
    throw networkError();
  }
  if (res.status === 204) return undefined as T;
  const data = await res.json().catch(() => null);
  if (!res.ok) throw toApiError(res.status, data, 'Request failed');
  return data as T;
}

export const get = <T>(url: string) => request<T>('GET', url);

export interface List<T> {
  items: T[];
  total: number;
}

export type QueryParams = Record<string, string | number | readonly string[] | undefined | null>;

/** A query schema's parameters as a caller writes them: its input (text), numbers also as numbers. */
export type QueryOf<S extends z.ZodTypeAny> = { [K in keyof z.input<S>]?: z.input<S>[K] | number };

/** URL-encoded parameters without the `?`; undefined, null and empty values are left out, lists comma-joined. */
export const queryString = (params: QueryParams) => {
  const q = new URLSearchParams();
  for (const [k, v] of Object.entries(params)) {
    if (v === undefined || v === null) continue;
    const text = Array.isArray(v) ? v.join(',') : String(v);
    if (text !== '') q.set(k, text);
  }
  return q.toString();
};

/** `path` with the parameters that have a value (no `?` when none has). */
export const withQuery = (path: string, params: QueryParams = {}) => {
  const q = queryString(params);
  return q ? `${path}?${q}` : path;
};

/** `encodeURIComponent` for one path segment (an id). */
export const seg = encodeURIComponent;

/** A multipart POST (files and fields); answers the body and the status (201 new, 200 already there). */
export async function postForm<T>(url: string, form: FormData, failed: string): Promise<{ data: T; status: number }> {
  let res: Response;
  try {
    res = await fetch(url, { method: 'POST', body: form, credentials: 'same-origin', headers: { Accept: 'application/json' } });
  } catch {
    throw networkError();
  }
  const data = await res.json().catch(() => null);
  if (!res.ok) throw toApiError(res.status, data, failed);
  return { data: data as T, status: res.status };
}

export interface UploadProgress {
  loaded: number;
  total: number;
}

/**
 * A multipart POST of one file (field `file`) that reports progress as the bytes leave the
 * browser: XMLHttpRequest rather than fetch, because only it reports upload progress.
 */
export function uploadFile<T>(
  url: string,
  file: File,
  options: { onProgress?: (p: UploadProgress) => void; signal?: AbortSignal; failed: string },
): Promise<T> {
  return new Promise<T>((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open('POST', url);
    xhr.setRequestHeader('Accept', 'application/json');
    xhr.withCredentials = true;
    xhr.upload.onprogress = (e) => {
      if (e.lengthComputable) options.onProgress?.({ loaded: e.loaded, total: e.total });
    };
    xhr.onload = () => {
      let data: ErrorBody = null;
      try {
        data = xhr.responseText ? JSON.parse(xhr.responseText) : null;
      } catch {
        data = null;
      }
      if (xhr.status >= 200 && xhr.status < 300) return resolve(data as T);
      reject(toApiError(xhr.status, data, options.failed));
    };
    xhr.onerror = () => reject(networkError());
    xhr.onabort = () => reject(new ApiError(0, 'ABORTED', 'Upload cancelled'));
    options.signal?.addEventListener('abort', () => xhr.abort(), { once: true });
    const form = new FormData();
    form.set('file', file);
    xhr.send(form);
  });
}
