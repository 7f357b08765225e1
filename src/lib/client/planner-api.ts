// Client calls of the planner page: the shortlist and a path profile. Antennas, cables, operators,
// geocoding and saving a plan go through their resources' modules (planning-api.ts, api.ts).
import { get, queryString as qs } from './api';
import type { PathResult } from './tools-api';
import type { AntennaJson, CableJson } from '../schemas/catalogue';
import type { GeocodeMatchJson } from '../schemas/addresses';
import type { OperatorRefJson } from '../schemas/mast-responses';
import type { CustomerJson } from '../schemas/customers';
import type { PlanJson } from '../schemas/plans';
import type { GradeJson, ShortlistItemJson, ShortlistJson, TerrainStatusJson } from '../schemas/shortlist';

export type Grade = GradeJson;
export type TerrainStatus = TerrainStatusJson;
export type ShortlistItem = ShortlistItemJson;
export type Shortlist = ShortlistJson;

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
  sim_operator: string;
  current_antenna_id: string;
}

export const plannerApi = {
  shortlist: (p: ShortlistParams) => get<Shortlist>(`/api/shortlist?${qs({ ...p })}`),
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
