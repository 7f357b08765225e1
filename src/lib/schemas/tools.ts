import { z } from 'zod';
import { modelDateParam, numberParam } from './params';

export const TechSchema = z.enum(['lte', 'nr', 'umts', 'gsm'], {
  errorMap: () => ({ message: 'Choose lte, nr, umts or gsm' }),
});

export const ChannelQuerySchema = z
  .object({
    tech: TechSchema,
    channel: numberParam('Channel')
      .refine((n) => Number.isInteger(n) && n >= 0, 'Channel must be a whole number ≥ 0')
      .optional(),
    freq_mhz: numberParam('Frequency')
      .refine((n) => n > 0, 'Frequency must be above 0 MHz')
      .optional(),
    band: z.string().trim().min(1, 'Name a band, e.g. B20 or n78').max(10, 'A band name is at most 10 characters').optional(),
  })
  .superRefine((v, ctx) => {
    if (v.channel === undefined && v.freq_mhz === undefined) {
      ctx.addIssue({ code: 'custom', path: ['channel'], message: 'Give a channel number or a frequency (freq_mhz)' });
    }
    if (v.channel !== undefined && v.freq_mhz !== undefined) {
      ctx.addIssue({ code: 'custom', path: ['freq_mhz'], message: 'Give either a channel number or a frequency, not both' });
    }
  });
export type ChannelQuery = z.infer<typeof ChannelQuerySchema>;

/** "lat,lon" in decimal degrees. */
export const LatLonParam = (label: string) =>
  z
    .string({ required_error: `${label} is required as lat,lon` })
    .trim()
    .transform((s, ctx) => {
      const parts = s.split(',').map((p) => p.trim());
      const [lat, lon] = parts.map(Number);
      if (parts.length !== 2 || parts.some((p) => p === '') || !Number.isFinite(lat) || !Number.isFinite(lon)) {
        ctx.addIssue({ code: 'custom', message: `${label} must be lat,lon in decimal degrees` });
        return z.NEVER;
      }
      if (lat < -90 || lat > 90) {
        ctx.addIssue({ code: 'custom', message: `${label}: latitude must be between -90 and 90` });
        return z.NEVER;
      }
      if (lon < -180 || lon > 180) {
        ctx.addIssue({ code: 'custom', message: `${label}: longitude must be between -180 and 180` });
        return z.NEVER;
      }
      return { lat, lon };
    });

const height = (label: string) =>
  numberParam(label)
    .refine((n) => n >= 0, `${label} cannot be negative`)
    .refine((n) => n <= 1000, `${label} above 1000 m is not an antenna height`)
    .optional()
    .default('0');

export const PathQuerySchema = z
  .object({
    from: LatLonParam('from'),
    to: LatLonParam('to'),
    freq_mhz: numberParam('Frequency')
      .refine((n) => n >= 30 && n <= 100_000, 'Frequency must be between 30 and 100000 MHz')
      .optional(),
    h1_m: height('Customer antenna height'),
    h2_m: height('Mast antenna height'),
    k: numberParam('Earth radius factor k')
      .refine((n) => n > 0 && n <= 10, 'k must be between 0 and 10')
      .optional(),
    date: modelDateParam.optional(),
  })
  .superRefine((v, ctx) => {
    if (v.from && v.to && v.from.lat === v.to.lat && v.from.lon === v.to.lon) {
      ctx.addIssue({ code: 'custom', path: ['to'], message: 'The two ends are the same point: move one of them' });
    }
  });
export type PathQuery = z.infer<typeof PathQuerySchema>;

// --- JSON the API returns -------------------------------------------------------------------

export interface ChannelJson {
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

export interface FrequencyJson {
  tech: string;
  freq_mhz: number;
  ambiguous: boolean;
  items: { band: string; channel: number; direction: 'DL' | 'UL' | 'both'; exact: boolean }[];
  total: number;
}

export interface ProfilePointJson {
  distance_m: number;
  ground_m: number;
  los_m: number;
  fresnel_m: number;
  bulge_m: number;
  clearance_m: number;
}

export interface PathJson {
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
    worst_clearance_m: number | null;
    worst_distance_m: number | null;
    nu: number | null;
    diffraction_loss_db: number;
    profile: ProfilePointJson[];
  };
  terrain_note?: string;
}
