// The only place islands call fetch. Error bodies become ApiError.
import type { Role } from '../domain/roles';
import type { OperatorJson } from '../schemas/operators';
import type { CellJson, MastJson } from '../schemas/masts';
import type { MastDetailJson, MastFeatureCollectionJson, ReadingJson, SearchHitJson } from '../schemas/mast-responses';
import type { RegionJson } from '../schemas/regions';
import type { InvitedUserJson, UserListItemJson } from '../schemas/users';

export type { OperatorJson, CellJson, MastDetailJson, MastJson, ReadingJson, SearchHitJson, RegionJson };

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

export type UserDto = UserListItemJson;
export type InvitedUserDto = InvitedUserJson;

export const usersApi = {
  list: () => get<List<UserDto>>('/api/users'),
  /** Makes the account and mails the person a link to choose their password. */
  invite: (input: { email: string; name: string; role: Role }) => request<InvitedUserDto>('POST', '/api/users', input),
  resendInvite: (id: string) => request<InvitedUserDto>('POST', `/api/users/${id}/invite`),
  update: (id: string, change: { role?: Role; disabled?: boolean; name?: string }) => request<UserDto>('PATCH', `/api/users/${id}`, change),
};

// --- Map: style, operators, masts, regions, search ---------------------------------------------

/** URL-encoded parameters without the `?`; undefined, null and empty values are left out, lists comma-joined. */
export const queryString = (params: Record<string, string | number | readonly string[] | undefined | null>) => {
  const q = new URLSearchParams();
  for (const [k, v] of Object.entries(params)) {
    if (v === undefined || v === null) continue;
    const text = Array.isArray(v) ? v.join(',') : String(v);
    if (text !== '') q.set(k, text);
  }
  return q.toString();
};

const query = (params: Record<string, string | number | readonly string[] | undefined>) => {
  const s = queryString(params);
  return s ? `?${s}` : '';
};

export const mapApi = {
  /** The basemap style (MapLibre style JSON) with absolute tile URLs. */
  style: <Style>() => get<Style>('/api/map/style.json'),
  search: (q: string, limit = 8) => get<List<SearchHitJson>>(`/api/search${query({ q, limit })}`),
};

export const operatorsApi = {
  list: () => get<List<OperatorJson>>('/api/operators'),
  create: (input: { name: string; mcc: string; mnc: string; colour?: string }) => request<OperatorJson>('POST', '/api/operators', input),
  update: (id: string, change: { name?: string; mcc?: string; mnc?: string; colour?: string }) =>
    request<OperatorJson>('PATCH', `/api/operators/${id}`, change),
};

export const mastsApi = {
  list: (filter: { bbox?: string; operator?: string[]; band?: string[]; tech?: string[]; status?: string[]; limit?: number } = {}) =>
    get<MastFeatureCollectionJson>(`/api/masts${query(filter)}`),
  get: (id: string) => get<MastDetailJson>(`/api/masts/${encodeURIComponent(id)}`),
  /** A new mast (body as MastInputSchema); answers 201 with the mast. */
  create: (input: Record<string, unknown>) => request<MastJson>('POST', '/api/masts', input),
  /** Partial change; `row_version` must be the one last read, or the answer is 409 (CONFLICT). */
  update: (id: string, change: Record<string, unknown> & { row_version: number }) => request<MastJson>('PATCH', `/api/masts/${encodeURIComponent(id)}`, change),
};

export const cellsApi = {
  /** A new cell on a mast (body as CellInputSchema: the channel must lie in the band). */
  create: (mastId: string, input: Record<string, unknown>) => request<CellJson>('POST', `/api/masts/${encodeURIComponent(mastId)}/cells`, input),
  /** Partial change, checked again as a whole; a stale `row_version` is refused with 409. */
  update: (id: string, change: Record<string, unknown> & { row_version: number }) => request<CellJson>('PATCH', `/api/cells/${encodeURIComponent(id)}`, change),
  /** Refused with 409 while a plan has chosen the cell. */
  remove: (id: string) => request<void>('DELETE', `/api/cells/${encodeURIComponent(id)}`),
};

export const regionsApi = {
  /** Outlines simplified to one pixel at `zoom` (never in full). */
  list: (zoom: number) => get<List<RegionJson>>(`/api/regions?zoom=${zoom}`),
  create: (input: { name: string; geometry: unknown }) => request<RegionJson>('POST', '/api/regions', input),
  update: (id: string, change: { name?: string; geometry?: unknown }) => request<RegionJson>('PATCH', `/api/regions/${id}`, change),
  remove: (id: string) => request<void>('DELETE', `/api/regions/${id}`),
};
