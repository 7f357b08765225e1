import { get, queryString as qs } from './api';

export interface ChannelResult {
  tech: string;
  channel: number;
  band: string;
  duplex: 'FDD' | 'TDD' | 'SDL';
  direction: 'DL' | 'UL' | 'both';
  dl_channel: number;
  dl_mhz: number;
  ul_channel: number | null;
  ul_mhz: number | null;
  alternative_bands: string[];
  notes: string[];
}

export interface FrequencyResult {
  tech: string;
  freq_mhz: number;
  ambiguous: boolean;
  items: { band: string; channel: number; direction: 'DL' | 'UL' | 'both'; exact: boolean }[];
  total: number;
}

export interface ProfilePoint {
  distance_m: number;
  ground_m: number;
  los_m: number;
  fresnel_m: number;
  bulge_m: number;
  clearance_m: number;
}

export interface PathResult {
  distance_m: number;
  bearing_true_deg: number;
  bearing_magnetic_deg: number;
  declination_deg: number;
  declination_date: string;
  reverse_bearing_true_deg: number;
  elevation_deg: number;
  fspl_db: number | null;
  fresnel_radius_mid_m: number | null;
  earth_bulge_mid_m: number;
  radio_horizon_km: number;
  k: number;
  terrain: null | {
    status: 'clear' | 'fresnel' | 'obstructed';
    worst_clearance_m: number;
    worst_distance_m: number;
    nu: number;
    diffraction_loss_db: number;
    profile: ProfilePoint[];
  };
  terrain_note?: string;
}

export const toolsApi = {
  channel: (tech: string, channel: string) => get<ChannelResult>(`/api/tools/channel?${qs({ tech, channel })}`),
  frequency: (tech: string, freq_mhz: string) => get<FrequencyResult>(`/api/tools/channel?${qs({ tech, freq_mhz })}`),
  path: (p: { from: string; to: string; freq_mhz?: string; h1_m?: string; h2_m?: string; date?: string }) =>
    get<PathResult>(`/api/tools/path?${qs(p)}`),
};
