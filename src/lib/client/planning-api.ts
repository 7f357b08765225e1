// Typed client calls for the catalogue, gazetteer, customers and plans. Response shapes are the
// API's own (snake_case, units in the names), declared beside the schemas.
import type { z } from 'zod';
import { get, networkError, operatorsApi, queryString as qs, request, toApiError, type List } from './api';
import type { AntennaJson, AntennaKind, CableJson } from '../schemas/catalogue';
import type { AddressImportJson, AddressJson, GeocodeMatchJson } from '../schemas/addresses';
import type { CustomerErasureJson, CustomerJson, CustomerSort, HistoryEntryJson } from '../schemas/customers';
import type { CheckPhase, InstallCheckJson, PlanChangeSchema, PlanDetailJson, PlanInputSchema, PlanJson } from '../schemas/plans';
import type { OperatorRefJson } from '../schemas/mast-responses';
import type { PlanState } from '../domain/plan-state';

export type {
  AntennaJson,
  CableJson,
  AddressJson,
  AddressImportJson,
  GeocodeMatchJson,
  CustomerJson,
  CustomerErasureJson,
  HistoryEntryJson,
  PlanJson,
  PlanDetailJson,
  InstallCheckJson,
};

// --- catalogue ----------------------------------------------------------------------------

export interface AntennaBody {
  name: string;
  kind: AntennaKind;
  ports: number;
  horizontal_beamwidth_deg?: number;
  gain_table: { freq_mhz: number; gain_dbi: number }[];
  notes?: string | null;
}

export interface CableBody {
  name: string;
  loss_table: { freq_mhz: number; loss_db_per_m: number }[];
  connector_loss_db: number;
  connectors: number;
  notes?: string | null;
}

export const catalogueApi = {
  antennas: () => get<List<AntennaJson>>('/api/catalogue/antennas'),
  createAntenna: (body: AntennaBody) => request<AntennaJson>('POST', '/api/catalogue/antennas', body),
  updateAntenna: (id: string, body: Partial<AntennaBody>) => request<AntennaJson>('PATCH', `/api/catalogue/antennas/${id}`, body),
  deleteAntenna: (id: string) => request<void>('DELETE', `/api/catalogue/antennas/${id}`),
  cables: () => get<List<CableJson>>('/api/catalogue/cables'),
  createCable: (body: CableBody) => request<CableJson>('POST', '/api/catalogue/cables', body),
  updateCable: (id: string, body: Partial<CableBody>) => request<CableJson>('PATCH', `/api/catalogue/cables/${id}`, body),
  deleteCable: (id: string) => request<void>('DELETE', `/api/catalogue/cables/${id}`),
};

// --- gazetteer ----------------------------------------------------------------------------

/** Uploads a CSV file as multipart (field `file`); the error body lists bad rows by line. */
async function importAddressFile(file: File): Promise<AddressImportJson> {
  const form = new FormData();
  form.append('file', file);
  let res: Response;
  try {
    res = await fetch('/api/addresses/import', { method: 'POST', body: form, credentials: 'same-origin', headers: { Accept: 'application/json' } });
  } catch {
    throw networkError();
  }
  const data = await res.json().catch(() => null);
  if (!res.ok) throw toApiError(res.status, data, 'Upload failed');
  return data as AddressImportJson;
}

export const addressesApi = {
  /** A page of the gazetteer: `after` is the previous page's `next` (keyset paging). */
  list: (p: { q?: string; limit?: number; after?: string } = {}) =>
    get<List<AddressJson> & { total_exact: boolean; next: string | null }>(`/api/addresses?${qs(p)}`),
  importFile: importAddressFile,
  geocode: (q: string, limit = 8) => get<List<GeocodeMatchJson>>(`/api/geocode?${qs({ q, limit })}`),
};

// --- reference ----------------------------------------------------------------------------

export type OperatorChoice = OperatorRefJson;

/** Operators to choose from (the list of GET /api/operators). */
export const referenceApi = { operators: () => operatorsApi.list() as Promise<List<OperatorChoice>> };

// --- customers ----------------------------------------------------------------------------

export interface CustomerBody {
  name: string;
  phone?: string | null;
  email?: string | null;
  address_label: string;
  postcode?: string | null;
  lat: number;
  lon: number;
  current_operator_id?: string | null;
  current_antenna_id?: string | null;
  notes?: string | null;
}

export const customersApi = {
  list: (p: { q?: string; state?: PlanState; sort?: CustomerSort; dir?: 'asc' | 'desc'; limit?: number; offset?: number } = {}) =>
    get<List<CustomerJson>>(`/api/customers?${qs(p)}`),
  get: (id: string) => get<CustomerJson>(`/api/customers/${id}`),
  create: (body: CustomerBody) => request<CustomerJson>('POST', '/api/customers', body),
  update: (id: string, body: Partial<CustomerBody> & { row_version: number }) => request<CustomerJson>('PATCH', `/api/customers/${id}`, body),
  history: (id: string) => get<List<HistoryEntryJson>>(`/api/customers/${id}/history`),
  /** Erases the customer's personal data on their request (planner/admin). */
  erase: (id: string) => request<CustomerErasureJson>('POST', `/api/customers/${id}/erasure`),
};

// --- plans --------------------------------------------------------------------------------

/** A new plan, as POST /api/plans takes it (with `customer`, a new customer saved in the same transaction). */
export type PlanBody = z.input<typeof PlanInputSchema>;

export type PlanChangeBody = z.input<typeof PlanChangeSchema>;

export interface InstallCheckBody {
  phase: CheckPhase;
  taken_at?: string;
  notes?: string | null;
  readings?: { pci: number; channel?: number | null; rsrp_dbm: number; rsrq_db?: number | null; sinr_db?: number | null }[];
  speed_tests?: { down_mbps: number; up_mbps: number; latency_ms?: number | null }[];
}

export const plansApi = {
  list: (p: { customer_id?: string; state?: PlanState; limit?: number; offset?: number } = {}) => get<List<PlanJson>>(`/api/plans?${qs(p)}`),
  get: (id: string) => get<PlanDetailJson>(`/api/plans/${id}`),
  create: (body: PlanBody) => request<PlanJson>('POST', '/api/plans', body),
  update: (id: string, body: PlanChangeBody) => request<PlanDetailJson>('PATCH', `/api/plans/${id}`, body),
  checks: (id: string) => get<List<InstallCheckJson>>(`/api/plans/${id}/checks`),
  addCheck: (id: string, body: InstallCheckBody) => request<InstallCheckJson>('POST', `/api/plans/${id}/checks`, body),
  /** Scheduled → installed, for planners and surveyors; 409 when the plan changed since `rowVersion`. */
  markInstalled: (id: string, rowVersion: number) => request<PlanDetailJson>('POST', `/api/plans/${id}/installed`, { row_version: rowVersion }),
};

export { checkWith } from './api';
