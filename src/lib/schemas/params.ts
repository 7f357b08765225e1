// Building blocks shared by the schemas: query-string parameters (values arrive as strings) and
// the common body fields.
import { z } from 'zod';

// --- Shared field set: every text, number and date that reaches the database goes through one of
// these, so that no value PostgreSQL cannot hold (NUL bytes, integers beyond int4, dates outside
// its range) gets past the schema.

/** PostgreSQL `integer` (int4) range. */
export const INT4_MIN = -2_147_483_648;
export const INT4_MAX = 2_147_483_647;
/** Years a date may have: anything else is a typing slip (0000, 9999, 275760). */
export const YEAR_MIN = 1900;
export const YEAR_MAX = 2200;

// eslint-disable-next-line no-control-regex
const CONTROL = /[\u0000-\u0008\u000b\u000c\u000e-\u001f\u007f]/;
/** True when text holds NUL or other control characters (tab, newline and carriage return are fine). */
export const hasControlChars = (s: string) => CONTROL.test(s);
const NO_CONTROL = 'Remove control characters (such as NUL) from the text';

/** Decimal notation only: no hex (`0x10`), binary, `Infinity` or blank. */
const DECIMAL = /^[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$/;

/** `YYYY-MM-DD` naming a day that exists, in YEAR_MIN–YEAR_MAX. */
export function isRealDate(text: string): boolean {
  const m = /^(\d{4})-(\d{2})-(\d{2})$/.exec(text);
  if (!m) return false;
  const [y, mo, d] = [Number(m[1]), Number(m[2]), Number(m[3])];
  if (y < YEAR_MIN || y > YEAR_MAX) return false;
  const t = new Date(Date.UTC(y, mo - 1, d));
  return t.getUTCFullYear() === y && t.getUTCMonth() === mo - 1 && t.getUTCDate() === d;
}

/** A calendar date `YYYY-MM-DD` (kept as text). */
export const dateField = z
  .string({ invalid_type_error: 'Use the form YYYY-MM-DD' })
  .trim()
  .regex(/^\d{4}-\d{2}-\d{2}$/, 'Use the form YYYY-MM-DD')
  .refine((s) => Number(s.slice(0, 4)) >= YEAR_MIN && Number(s.slice(0, 4)) <= YEAR_MAX, `The year must be between ${YEAR_MIN} and ${YEAR_MAX}`)
  .refine(isRealDate, 'Not a real date');

/** An ISO 8601 date and time with its offset (`2027-03-01T10:30:00Z`), as a Date. */
export const dateTimeField = z
  .string({ invalid_type_error: 'Use an ISO date and time, e.g. 2027-03-01T10:30:00Z' })
  .trim()
  .datetime({ offset: true, message: 'Use an ISO date and time, e.g. 2027-03-01T10:30:00Z' })
  .refine((s) => isRealDate(s.slice(0, 10)), `Not a real date, or a year outside ${YEAR_MIN}–${YEAR_MAX}`)
  .transform((s) => new Date(s));

/** A whole JSON number within int4 unless narrower bounds are given. */
export const intField = (label: string, min = INT4_MIN, max = INT4_MAX) =>
  z
    .number({ required_error: `${label} is required`, invalid_type_error: `${label} must be a number` })
    .int(`${label} must be a whole number`)
    .min(min, `${label} must be at least ${min}`)
    .max(max, `${label} must be at most ${max}`);

/** Plain text: trimmed, at most `max` characters, no control characters. */
export const textField = (max: number) =>
  z
    .string({ invalid_type_error: 'Must be text' })
    .trim()
    .max(max, `At most ${max} characters`)
    .refine((s) => !hasControlChars(s), NO_CONTROL);

/**
 * Plain words for the checks a schema leaves unworded, instead of the library's own
 * ("String must contain at most 120 character(s)"). Set once for every schema.
 */
export const plainErrorMap: z.ZodErrorMap = (issue, ctx) => {
  switch (issue.code) {
    case z.ZodIssueCode.invalid_type:
      if (issue.received === 'undefined' || issue.received === 'null') return { message: 'Required' };
      if (issue.expected === 'number') return { message: 'Must be a number' };
      if (issue.expected === 'string') return { message: 'Must be text' };
      if (issue.expected === 'array') return { message: 'Must be a list' };
      if (issue.expected === 'object') return { message: 'Must be an object' };
      return { message: `Must be ${issue.expected}` };
    case z.ZodIssueCode.too_big:
      if (issue.type === 'string') return { message: `At most ${issue.maximum} characters` };
      if (issue.type === 'array') return { message: `At most ${issue.maximum} items` };
      if (issue.type === 'number') return { message: `At most ${issue.maximum}` };
      break;
    case z.ZodIssueCode.too_small:
      if (issue.type === 'string') return { message: Number(issue.minimum) <= 1 ? 'Required' : `At least ${issue.minimum} characters` };
      if (issue.type === 'array') return { message: `At least ${issue.minimum} items` };
      if (issue.type === 'number') return { message: `At least ${issue.minimum}` };
      break;
    case z.ZodIssueCode.invalid_string:
      if (issue.validation === 'email') return { message: 'Enter a valid e-mail address' };
      if (issue.validation === 'url') return { message: 'Enter a valid web address' };
      return { message: 'Not in the expected form' };
    case z.ZodIssueCode.not_finite:
      return { message: 'Must be a finite number' };
    case z.ZodIssueCode.unrecognized_keys:
      return { message: `Unknown field${issue.keys.length === 1 ? '' : 's'}: ${issue.keys.join(', ')}` };
    default:
      break;
  }
  return { message: ctx.defaultError };
};
z.setErrorMap(plainErrorMap);

export const numberParam = (label: string) =>
  z
    .string({ required_error: `${label} is required` })
    .trim()
    .min(1, `${label} is required`)
    .refine((s) => DECIMAL.test(s) && Number.isFinite(Number(s)), `${label} must be a number`)
    .transform(Number);

/** A database id: digits without leading zeros (`01` is not `1`); pages check route ids with it too. */
export const ID_PATTERN = /^[1-9]\d{0,17}$/;

export const idParam = z.string().regex(ID_PATTERN, 'Not a valid id');

/** The `[id]` of a route. */
export const IdParamSchema = z.object({ id: idParam });

/** A whole number in a query string; absent means `fallback`. */
export const intParam = (label: string, min: number, max: number, fallback: number) =>
  z
    .string()
    .trim()
    .regex(/^\d{1,15}$/, `${label} must be a whole number`)
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
export const searchParam = textField(200)
  .optional()
  .transform((s) => s || undefined);

/** A calendar date inside the magnetic model's validity (WMM2025: 2025–2029). */
export const modelDateParam = z
  .string()
  .regex(/^\d{4}-\d{2}-\d{2}$/, 'Date must be YYYY-MM-DD')
  .refine(isRealDate, 'Not a real date')
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
  z
    .string({ required_error: 'Required', invalid_type_error: 'Required' })
    .trim()
    .min(1, 'Required')
    .max(max, `At most ${max} characters`)
    .refine((s) => !hasControlChars(s), NO_CONTROL);

/** Optional free text: blank becomes null. */
export const optionalText = (max: number) =>
  z
    .string({ invalid_type_error: 'Must be text' })
    .trim()
    .max(max, `At most ${max} characters`)
    .refine((s) => !hasControlChars(s), NO_CONTROL)
    .nullish()
    .transform((s) => (s ? s : null));

/** A database id given as a string ("12") or a number (12). */
export const IdRefSchema = z
  .union([z.string().trim().regex(ID_PATTERN, 'Not a valid id'), z.number().int().positive().max(Number.MAX_SAFE_INTEGER)], {
    errorMap: () => ({ message: 'Not a valid id' }),
  })
  .transform(String);

/** For change schemas: true when at least one field is given. */
export const hasAnyField = (v: Record<string, unknown>) => Object.values(v).some((x) => x !== undefined);

/** For change schemas with optimistic concurrency: true when a field besides `row_version` is given. */
export const hasChange = (v: Record<string, unknown>) => Object.entries(v).some(([k, x]) => k !== 'row_version' && x !== undefined);

/** The version a change was made against (optimistic concurrency): a whole number from 1. */
export const RowVersionSchema = numberField('Row version', 'Row version must be a number')
  .int('Row version must be a whole number')
  .min(1, 'Row version must be at least 1')
  .max(INT4_MAX, 'Row version is too large');
