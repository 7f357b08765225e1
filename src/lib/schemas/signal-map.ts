// Query of the measured signal map's tiles: one operator and one of its bands at most (empty: all).
import { z } from 'zod';
import { ID_PATTERN } from './params';
import { resolveBandLabel } from './radio';

const empty = (v: unknown) => (v === '' ? undefined : v);

export const SignalTileQuerySchema = z
  .object({
    operator: z.preprocess(empty, z.string().regex(ID_PATTERN, 'Operator must be an operator id').optional()),
    band: z.preprocess(
      empty,
      z
        .string()
        .max(12, 'Unknown band')
        // Exactly as cells store it (B20, n78, VIII, DCS1800): a hexagon belongs to one stored band.
        .refine((label) => resolveBandLabel(label).some((ref) => ref.band === label), { message: 'Unknown band (as on the cells, e.g. B20, B3, n78)' })
        .optional(),
    ),
  })
  // Hexagons are kept per operator and band: a band is one operator's.
  .refine((q) => !q.band || q.operator, { path: ['band'], message: 'Choose an operator to choose a band' })
  .transform((q) => ({ operatorId: q.operator ?? null, band: q.band ?? null }));

export type SignalTileQuery = z.output<typeof SignalTileQuerySchema>;
