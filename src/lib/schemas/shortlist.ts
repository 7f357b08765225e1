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
  radius_m: numberParam('Radius')
    .refine((n) => n >= 500 && n <= 80_000, 'Radius must be between 500 m and 80 km')
    .optional(),
  date: modelDateParam.optional(),
});
export type ShortlistQuery = z.infer<typeof ShortlistQuerySchema>;
