// Building blocks shared by the schemas: query-string parameters (values arrive as strings) and
// the common body fields.
import { z } from 'zod';

export const numberParam = (label: string) =>
  z
    .string({ required_error: `${label} is required` })
    .trim()
    .min(1, `${label} is required`)
    .refine((s) => Number.isFinite(Number(s)), `${label} must be a number`)
    .transform(Number);

export const idParam = z.string().regex(/^\d{1,18}$/, 'Not a valid id');

/** The `[id]` of a route. */
export const IdParamSchema = z.object({ id: idParam });

/** A whole number in a query string; absent means `fallback`. */
export const intParam = (label: string, min: number, max: number, fallback: number) =>
  z
    .string()
    .trim()
    .regex(/^\d+$/, `${label} must be a whole number`)
    .transform(Number)
    .refine((n) => n >= min && n <= max, `${label} must be between ${min} and ${max}`)
    .optional()
    .transform((n) => n ?? fallback);

/** `limit` and `offset` of a paged list. */
export const pageParams = {
  limit: intParam('limit', 1, 200, 50),
  offset: intParam('offset', 0, 10_000_000, 0),
};

/** Optional search text of a list; blank means no search. */
export const searchParam = z.string().trim().max(200, 'At most 200 characters').optional().transform((s) => s || undefined);

/** A calendar date inside the magnetic model's validity (WMM2025: 2025–2029). */
export const modelDateParam = z
  .string()
  .regex(/^\d{4}-\d{2}-\d{2}$/, 'Date must be YYYY-MM-DD')
  .refine((s) => !Number.isNaN(Date.parse(`${s}T00:00:00Z`)), 'Not a real date')
  .transform((s) => new Date(`${s}T00:00:00Z`))
  .refine((d) => d.getUTCFullYear() >= 2025 && d.getUTCFullYear() <= 2029, 'The magnetic model covers 2025–2029');

// --- Body fields ----------------------------------------------------------------------------

/** One of a fixed list; the message lists the choices. */
export const enumOf = <T extends readonly [string, ...string[]]>(values: T) =>
  z.enum(values, { errorMap: () => ({ message: `Choose one of: ${values.join(', ')}` }) });

/** A JSON number; `finiteMessage` replaces zod's own for ±Infinity. */
export const numberField = (label: string, finiteMessage?: string) =>
  z.number({ required_error: `${label} is required`, invalid_type_error: `${label} must be a number` }).finite(finiteMessage);

/** Required text, trimmed. */
export const requiredText = (max: number) =>
  z.string({ required_error: 'Required', invalid_type_error: 'Required' }).trim().min(1, 'Required').max(max, `At most ${max} characters`);

/** Optional free text: blank becomes null. */
export const optionalText = (max: number) =>
  z
    .string({ invalid_type_error: 'Must be text' })
    .trim()
    .max(max, `At most ${max} characters`)
    .nullish()
    .transform((s) => (s ? s : null));

/** A database id given as a string ("12") or a number (12). */
export const IdRefSchema = z
  .union([z.string().trim().regex(/^\d{1,18}$/, 'Not a valid id'), z.number().int().positive().max(Number.MAX_SAFE_INTEGER)], {
    errorMap: () => ({ message: 'Not a valid id' }),
  })
  .transform(String);

/** For change schemas: true when at least one field is given. */
export const hasAnyField = (v: Record<string, unknown>) => Object.values(v).some((x) => x !== undefined);

/** For change schemas with optimistic concurrency: true when a field besides `row_version` is given. */
export const hasChange = (v: Record<string, unknown>) => Object.entries(v).some(([k, x]) => k !== 'row_version' && x !== undefined);
