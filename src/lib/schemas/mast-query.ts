// Query strings of the mast list, mast delete and search: bounding box, filter lists and limits.
import { z } from 'zod';
import { resolveBandLabel, type BandRef } from './radio';
import { MastStatusSchema, TechSchema, type MastStatus, type Tech } from './mast-enums';
import { ID_PATTERN, intParam, RowVersionSchema } from './params';

export interface Bbox {
  minLon: number;
  minLat: number;
  maxLon: number;
  maxLat: number;
}

/** `minLon,minLat,maxLon,maxLat` in WGS84 degrees (the order of RFC 7946 §5). */
export const BboxSchema = z.string().transform((text, ctx): Bbox => {
  const parts = text.split(',').map((p) => p.trim());
  const nums = parts.map((p) => (p === '' ? Number.NaN : Number(p)));
  if (parts.length !== 4 || nums.some((n) => !Number.isFinite(n))) {
    ctx.addIssue({ code: 'custom', message: 'Give four numbers: minLon,minLat,maxLon,maxLat' });
    return z.NEVER;
  }
  const [minLon, minLat, maxLon, maxLat] = nums as [number, number, number, number];
  if ([minLon, maxLon].some((v) => v < -180 || v > 180)) ctx.addIssue({ code: 'custom', message: 'Longitudes must be between −180 and 180' });
  if ([minLat, maxLat].some((v) => v < -90 || v > 90)) ctx.addIssue({ code: 'custom', message: 'Latitudes must be between −90 and 90' });
  if (minLon > maxLon || minLat > maxLat) ctx.addIssue({ code: 'custom', message: 'The minimum must not exceed the maximum' });
  return { minLon, minLat, maxLon, maxLat };
});

/** A comma-separated list in a query string; empty items are ignored; errors name the list, not the item. */
const listOf = <T>(item: z.ZodType<T, z.ZodTypeDef, string>, label: string) =>
  z.string().transform((text, ctx): T[] | undefined => {
    const parts = text
      .split(',')
      .map((s) => s.trim())
      .filter(Boolean);
    if (parts.length > 50) {
      ctx.addIssue({ code: 'custom', message: `At most 50 ${label}` });
      return z.NEVER;
    }
    const out: T[] = [];
    for (const part of parts) {
      const r = item.safeParse(part);
      if (r.success) out.push(r.data);
      else for (const issue of r.error.issues) ctx.addIssue({ code: 'custom', message: issue.message });
    }
    return out.length ? out : undefined;
  });

const IdItemSchema = z.string().regex(ID_PATTERN, 'Operator ids are whole numbers');

const BandItemSchema = z.string().transform((label, ctx) => {
  const refs = resolveBandLabel(label);
  if (refs.length === 0) {
    ctx.addIssue({ code: 'custom', message: `Unknown band '${label}' (e.g. B20, B3, n78)` });
    return z.NEVER;
  }
  return refs;
});

const filterFields = {
  operator: listOf(IdItemSchema, 'operators').optional(),
  band: listOf(BandItemSchema, 'bands').optional(),
  tech: listOf(TechSchema, 'technologies').optional(),
  status: listOf(MastStatusSchema, 'statuses').optional(),
};

/** Filters shared by the mast list and the mast tiles: OR within one list, AND across lists. */
export interface MastFilter {
  operatorIds?: string[];
  bands?: BandRef[];
  techs?: Tech[];
  statuses?: MastStatus[];
}

const toFilter = (q: { operator?: string[]; band?: BandRef[][]; tech?: Tech[]; status?: MastStatus[] }): MastFilter => ({
  operatorIds: q.operator,
  bands: q.band?.flat(),
  techs: q.tech,
  statuses: q.status,
});

export const MastFilterSchema = z.object(filterFields).transform(toFilter);

export const MAST_LIST_LIMIT = 5000;

export const MastListQuerySchema = z
  .object({
    ...filterFields,
    bbox: BboxSchema.optional(),
    limit: intParam('Limit', 1, MAST_LIST_LIMIT, MAST_LIST_LIMIT),
  })
  .transform((q) => ({ bbox: q.bbox, limit: q.limit, ...toFilter(q) }));
export type MastListQuery = z.output<typeof MastListQuerySchema>;

export const MastDeleteQuerySchema = z.object({
  row_version: z
    .string()
    .regex(/^[1-9]\d{0,9}$/, 'Row version must be a whole number')
    .transform(Number)
    .pipe(RowVersionSchema)
    .optional(),
});

export const SearchQuerySchema = z.object({
  q: z.string({ required_error: 'Type something to search for' }).trim().min(1, 'Type something to search for').max(100, 'At most 100 characters'),
  limit: intParam('limit', 1, 50, 10),
});
