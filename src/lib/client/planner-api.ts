// Client calls of the planner page.
import { get, queryString as qs, request, type List } from './api';
import type { PathResult } from './tools-api';
import type { AntennaJson, CableJson } from '../schemas/catalogue';
import type { GeocodeMatchJson } from '../schemas/addresses';
import type { OperatorRefJson } from '../schemas/masts';
import type { CustomerJson } from '../schemas/customers';
import type { PlanJson } from '../schemas/plans';

export type Grade = 'excellent' | 'good' | 'fair' | 'poor' | 'unusable';
export type TerrainStatus = 'clear' | 'fresnel' | 'obstructed' | 'unknown';

export interface ShortlistItem {
  rank: number;
  cell_id: string;
  mast: { id: string; name: string; lat: number; lon: number; ground_m: number | null };
  operator: { id: string; name: string; colour: string | null };
  tech: string;
  band: string;
  channel: number;
  freq_mhz: number;
  pci: number | null;
  sector_azimuth_deg: number | null;
  antenna_height_m: number | null;
  distance_m: number;
  bearing_true_deg: number;
  bearing_magnetic_deg: number;
  declination_deg: number;
  bearing_from_mast_deg: number;
  sector_offset_deg: number | null;
  elevation_deg: number;
  terrain: { status: TerrainStatus; worst_clearance_m: number | null; worst_distance_m: number | null; diffraction_loss_db: number };
  path_loss_db: number;
  predicted_rsrp_dbm: number;
  expected_gain_db: number | null;
  grade: Grade;
  calibration: { readings_used: number; residual_db: number } | null;
  budget: { key: string; label: string; db: number }[];
  warnings: string[];
}

export interface Shortlist {
  lat: number;
  lon: number;
  radius_m: number;
  customer_ground_m: number | null;
  kit: { antenna: { id: string; name: string }; cable: { id: string; name: string } | null; cable_m: number; height_m: number };
  current_antenna: { id: string; name: string } | null;
  items: ShortlistItem[];
  total: number;
}

export type AntennaOption = Pick<AntennaJson, 'id' | 'name' | 'kind' | 'ports' | 'horizontal_beamwidth_deg'>;
export type CableOption = Pick<CableJson, 'id' | 'name' | 'connector_loss_db' | 'connectors'>;
export type OperatorOption = OperatorRefJson;
export type GeocodeMatch = GeocodeMatchJson;

export interface ShortlistParams {
  lat: number;
  lon: number;
  height_m: string;
  antenna_id: string;
  cable_id: string;
  cable_m: string;
  operator: string;
  current_antenna_id: string;
}

export const plannerApi = {
  shortlist: (p: ShortlistParams) => get<Shortlist>(`/api/shortlist?${qs({ ...p })}`),
  antennas: () => get<List<AntennaOption>>('/api/catalogue/antennas'),
  cables: () => get<List<CableOption>>('/api/catalogue/cables'),
  operators: () => get<List<OperatorOption>>('/api/operators'),
  geocode: (q: string) => get<List<GeocodeMatch>>(`/api/geocode?${qs({ q, limit: 8 })}`),
  profile: (from: { lat: number; lon: number }, item: ShortlistItem, h1: string) =>
    get<PathResult>(
      `/api/tools/path?${qs({
        from: `${from.lat},${from.lon}`,
        to: `${item.mast.lat},${item.mast.lon}`,
        freq_mhz: item.freq_mhz,
        h1_m: h1,
        h2_m: item.antenna_height_m ?? 25,
      })}`,
    ),
};

export type SavedPlan = Pick<PlanJson, 'id' | 'customer_id' | 'state'>;
export type SavedCustomer = Pick<CustomerJson, 'id' | 'name'>;

export const planSaveApi = {
  createCustomer: (input: { name: string; address_label: string; lat: number; lon: number; current_antenna_id?: string | null }) =>
    request<SavedCustomer>('POST', '/api/customers', input),
  createPlan: (input: {
    customer_id: string;
    cell_id: string;
    antenna_id: string;
    cable_id: string | null;
    cable_m: number | null;
    mount_height_m: number;
    figures: Record<string, unknown>;
    state: 'planned';
  }) => request<SavedPlan>('POST', '/api/plans', input),
};
