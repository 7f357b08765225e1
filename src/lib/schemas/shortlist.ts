import { z } from 'zod';
import { idParam, modelDateParam, numberParam } from './params';

export const ShortlistQuerySchema = z.object({
  lat: numberParam('Latitude').refine((n) => n >= -90 && n <= 90, 'Latitude must be between -90 and 90'),
  lon: numberParam('Longitude').refine((n) => n >= -180 && n <= 180, 'Longitude must be between -180 and 180'),
  height_m: numberParam('Mount height')
    .refine((n) => n >= 0 && n <= 100, 'Mount height must be between 0 and 100 m')
    .optional()
    .default('6'),
  antenna_id: idParam.optional(),
  cable_id: idParam.optional(),
  cable_m: numberParam('Cable length')
    .refine((n) => n >= 0 && n <= 200, 'Cable length must be between 0 and 200 m')
    .optional()
    .default('10'),
  current_antenna_id: idParam.optional(),
  operator: idParam.optional(),
  /** The customer's SIM operator: only its cells are listed. */
  sim_operator: idParam.optional(),
  radius_m: numberParam('Radius')
    .refine((n) => n >= 500 && n <= 80_000, 'Radius must be between 500 m and 80 km')
    .optional(),
  date: modelDateParam.optional(),
});
export type ShortlistQuery = z.infer<typeof ShortlistQuerySchema>;

// --- JSON the API returns -------------------------------------------------------------------

export type GradeJson = 'excellent' | 'good' | 'fair' | 'poor' | 'unusable';
export type TerrainStatusJson = 'clear' | 'fresnel' | 'obstructed' | 'unknown';
export type CalibrationConfidenceJson = 'high' | 'medium' | 'low';

export interface ShortlistItemJson {
  rank: number;
  cell_id: string;
  mast: { id: string; name: string; lat: number; lon: number; ground_m: number | null };
  operator: { id: string; name: string; colour: string | null };
  /** The preferred operator's cell. */
  preferred: boolean;
  tech: string;
  band: string;
  channel: number;
  freq_mhz: number;
  bandwidth_mhz: number;
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
  terrain: { status: TerrainStatusJson; worst_clearance_m: number | null; worst_distance_m: number | null; diffraction_loss_db: number };
  path_loss_db: number;
  predicted_rsrp_dbm: number;
  expected_gain_db: number | null;
  grade: GradeJson;
  sinr_db: number | null;
  sinr_grade: GradeJson | null;
  interferers: number;
  expected_throughput_mbps: number | null;
  score: number;
  calibration: {
    readings_used: number;
    median_residual_db: number;
    residual_db: number;
    weight: number;
    uncertainty_db: number;
    confidence: CalibrationConfidenceJson;
  } | null;
  budget: { key: string; label: string; db: number }[];
  warnings: string[];
}

export interface ShortlistJson {
  lat: number;
  lon: number;
  radius_m: number;
  customer_ground_m: number | null;
  kit: { antenna: { id: string; name: string }; cable: { id: string; name: string } | null; cable_m: number; height_m: number };
  current_antenna: { id: string; name: string } | null;
  required_operator_id: string | null;
  warnings: string[];
  items: ShortlistItemJson[];
  total: number;
}
