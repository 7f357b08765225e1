// The only place islands call fetch. Error bodies become ApiError.
import type { Role } from '../domain/roles';

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
    throw new ApiError(0, 'NETWORK', 'The server could not be reached. Check your connection and try again.');
  }
  if (res.status === 204) return undefined as T;
  const data = await res.json().catch(() => null);
  if (!res.ok) {
    const err = data?.error;
    throw new ApiError(res.status, err?.code ?? 'UNKNOWN', err?.message ?? `Request failed (${res.status})`, err?.fields ?? {});
  }
  return data as T;
}

export const get = <T>(url: string) => request<T>('GET', url);

export interface List<T> {
  items: T[];
  total: number;
}

export interface UserDto {
  id: string;
  email: string;
  name: string;
  role: Role;
  disabledAt: string | null;
  createdAt: string;
}

export const usersApi = {
  list: () => get<List<UserDto>>('/api/users'),
  create: (input: { email: string; name: string; role: Role; password: string }) => request<UserDto>('POST', '/api/users', input),
  update: (id: string, change: { role?: Role; disabled?: boolean; name?: string }) => request<UserDto>('PATCH', `/api/users/${id}`, change),
};

// --- Map: style, operators, masts, regions, search ---------------------------------------------

export type MastStatusDto = 'active' | 'planned' | 'decommissioned';
export type TechDto = 'gsm' | 'umts' | 'lte' | 'nr';

export interface OperatorDto {
  id: string;
  name: string;
  mcc: string;
  mnc: string;
  plmn: string;
  colour: string;
  cell_count: number;
  created_at: string;
  updated_at: string;
}

export interface OperatorRefDto {
  id: string;
  name: string;
  colour: string;
}

export interface CellDto {
  id: string;
  mast_id: string;
  operator: OperatorRefDto;
  tech: TechDto;
  band: string;
  channel: number;
  dl_mhz: number | null;
  pci: number | null;
  cell_identity: number | null;
  sector_azimuth_deg: number | null;
  antenna_height_m: number | null;
  bandwidth_mhz: number | null;
  rs_power_dbm: number;
  last_observed_at: string | null;
}

export interface ReadingDto {
  id: string;
  taken_at: string;
  lat: number;
  lon: number;
  tech: TechDto;
  channel: number | null;
  pci: number | null;
  rsrp_dbm: number | null;
  rsrq_db: number | null;
  sinr_db: number | null;
  rssi_dbm: number | null;
  cell_id: string | null;
  device: string | null;
  source: string | null;
}

export interface MastDetailDto {
  id: string;
  name: string;
  reference: string | null;
  lat: number;
  lon: number;
  ground_elevation_m: number | null;
  structure_height_m: number | null;
  structure_type: string;
  status: MastStatusDto;
  access_notes: string | null;
  source: string;
  created_at: string;
  updated_at: string;
  row_version: number;
  operators: OperatorRefDto[];
  cells: CellDto[];
  recent_readings: ReadingDto[];
}

export interface MastFeatureDto {
  type: 'Feature';
  id: number;
  geometry: { type: 'Point'; coordinates: [number, number] };
  properties: { id: string; name: string; reference: string | null; status: MastStatusDto; bands: string[]; techs: TechDto[]; cell_count: number; operators: OperatorRefDto[] };
}

export interface MastCollectionDto {
  type: 'FeatureCollection';
  features: MastFeatureDto[];
  truncated: boolean;
}

export interface SearchHitDto {
  kind: 'mast' | 'place';
  id: string;
  name: string;
  detail: string | null;
  lat: number;
  lon: number;
}

export interface RegionDto {
  id: string;
  name: string;
  geometry: { type: 'MultiPolygon'; coordinates: number[][][][] };
  area_km2: number;
  created_at: string;
  updated_at: string;
}

export type PolygonGeometryDto = { type: 'Polygon'; coordinates: number[][][] } | { type: 'MultiPolygon'; coordinates: number[][][][] };

const query = (params: Record<string, string | number | readonly string[] | undefined>) => {
  const q = new URLSearchParams();
  for (const [k, v] of Object.entries(params)) {
    if (v === undefined) continue;
    const text = Array.isArray(v) ? v.join(',') : String(v);
    if (text !== '') q.set(k, text);
  }
  const s = q.toString();
  return s ? `?${s}` : '';
};

export const mapApi = {
  /** The basemap style (MapLibre style JSON) with absolute tile URLs. */
  style: <Style>() => get<Style>('/api/map/style.json'),
  search: (q: string, limit = 8) => get<List<SearchHitDto>>(`/api/search${query({ q, limit })}`),
};

export const operatorsApi = {
  list: () => get<List<OperatorDto>>('/api/operators'),
  create: (input: { name: string; mcc: string; mnc: string; colour?: string }) => request<OperatorDto>('POST', '/api/operators', input),
  update: (id: string, change: { name?: string; mcc?: string; mnc?: string; colour?: string }) => request<OperatorDto>('PATCH', `/api/operators/${id}`, change),
};

export const mastsApi = {
  list: (filter: { bbox?: string; operator?: string[]; band?: string[]; tech?: string[]; status?: string[]; limit?: number } = {}) =>
    get<MastCollectionDto>(`/api/masts${query(filter)}`),
  get: (id: string) => get<MastDetailDto>(`/api/masts/${encodeURIComponent(id)}`),
  /** Partial change; `row_version` must be the one last read, or the answer is 409 (CONFLICT). */
  update: (id: string, change: Record<string, unknown> & { row_version: number }) =>
    request<Omit<MastDetailDto, 'operators' | 'cells' | 'recent_readings'>>('PATCH', `/api/masts/${encodeURIComponent(id)}`, change),
};

export const regionsApi = {
  list: () => get<List<RegionDto>>('/api/regions'),
  create: (input: { name: string; geometry: unknown }) => request<RegionDto>('POST', '/api/regions', input),
  update: (id: string, change: { name?: string; geometry?: unknown }) => request<RegionDto>('PATCH', `/api/regions/${id}`, change),
  remove: (id: string) => request<void>('DELETE', `/api/regions/${id}`),
};
