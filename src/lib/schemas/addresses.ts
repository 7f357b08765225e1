// Gazetteer: the CSV import format (checked the same way in the browser and on the server),
// search queries, and the JSON shapes the API returns.
import Papa from 'papaparse';
import { z } from 'zod';
import { defineRecord, field, type JsonOf, type ValueOf } from './record';
import { intParam, pageParams, searchParam } from './params';

/** Files up to this size are checked in the browser before upload; the server checks every file. */
export const ADDRESS_PRECHECK_MAX_BYTES = 5 * 1024 * 1024;
export const ADDRESS_CSV_COLUMNS = ['label', 'postcode', 'lat', 'lon'] as const;
const REQUIRED_COLUMNS = ['label', 'lat', 'lon'] as const;
/** Beyond this many bad rows the report stops listing them (the count stays exact). */
export const MAX_REPORTED_ROW_ERRORS = 200;

const coordinate = (label: string, limit: number) =>
  z
    .string()
    .trim()
    .transform((s, ctx) => {
      const message = !s
        ? `${label} is empty`
        : !/^[-+]?(\d+\.?\d*|\.\d+)$/.test(s)
          ? `${label} must be a number in decimal degrees`
          : Math.abs(Number(s)) > limit
            ? `${label} must be between -${limit} and ${limit}`
            : null;
      if (message) {
        ctx.addIssue({ code: 'custom', message });
        return z.NEVER;
      }
      return Number(s);
    });

export const AddressRowSchema = z.object({
  label: z.string().trim().min(1, 'label is empty').max(300, 'label is longer than 300 characters'),
  postcode: z
    .string()
    .trim()
    .max(12, 'postcode is longer than 12 characters')
    .transform((s) => (s ? s.toUpperCase().replace(/\s+/g, ' ') : null)),
  lat: coordinate('lat', 90),
  lon: coordinate('lon', 180),
});
export type AddressRow = z.output<typeof AddressRowSchema>;

export interface CsvRowError {
  line: number;
  messages: string[];
}

export interface AddressCsvResult {
  rows: Array<AddressRow & { line: number }>;
  errors: CsvRowError[];
  /** Problems with the file as a whole (no header, missing columns, no rows). */
  fileErrors: string[];
}

const matchKey = (r: AddressRow) => `${r.label.toLowerCase()}|${(r.postcode ?? '').replace(/ /g, '')}`;

/**
 * Parses and checks a gazetteer CSV. Line numbers count physical lines from 1 (the header),
 * so a quoted label spanning two lines is reported at the line where it starts.
 */
export function parseAddressCsv(input: string): AddressCsvResult {
  const text = input.replace(/^\uFEFF/, '').replace(/\r\n?/g, '\n');
  const result: AddressCsvResult = { rows: [], errors: [], fileErrors: [] };
  let header: string[] | null = null;
  let index: Record<string, number> = {};
  let scanned = 0;
  let newlines = 0;
  const seen = new Map<string, number>();

  Papa.parse<string[]>(text, {
    newline: '\n',
    skipEmptyLines: 'greedy',
    step: (step) => {
      const cursor = step.meta.cursor;
      const end = text[cursor - 1] === '\n' ? cursor - 1 : cursor;
      for (let i = scanned; i < end; i++) if (text.charCodeAt(i) === 10) newlines++;
      scanned = end;
      const fields = step.data;
      const inner = fields.reduce((n, f) => n + (f.match(/\n/g)?.length ?? 0), 0);
      const line = newlines + 1 - inner;

      if (!header) {
        header = fields.map((h) => h.trim().toLowerCase());
        index = Object.fromEntries(header.map((h, i) => [h, i]));
        const missing = REQUIRED_COLUMNS.filter((c) => !(c in index));
        if (missing.length)
          result.fileErrors.push(`Missing column${missing.length > 1 ? 's' : ''}: ${missing.join(', ')} (expected ${ADDRESS_CSV_COLUMNS.join(', ')})`);
        return;
      }
      if (result.fileErrors.length) return;
      const messages: string[] = [];
      if (fields.length !== header.length) messages.push(`expected ${header.length} values, found ${fields.length}`);
      for (const e of step.errors) messages.push(e.message);
      const raw = {
        label: fields[index.label!] ?? '',
        postcode: index.postcode === undefined ? '' : (fields[index.postcode] ?? ''),
        lat: fields[index.lat!] ?? '',
        lon: fields[index.lon!] ?? '',
      };
      const parsed = AddressRowSchema.safeParse(raw);
      if (!parsed.success) messages.push(...parsed.error.issues.map((i) => i.message));
      else if (messages.length === 0) {
        const key = matchKey(parsed.data);
        const first = seen.get(key);
        if (first !== undefined) messages.push(`same label and postcode as line ${first}`);
        else seen.set(key, line);
      }
      if (messages.length) result.errors.push({ line, messages });
      else if (parsed.success) result.rows.push({ ...parsed.data, line });
    },
  });

  if (!header) result.fileErrors.push(`The file is empty; the first line must name the columns ${ADDRESS_CSV_COLUMNS.join(', ')}`);
  else if (!result.fileErrors.length && result.rows.length === 0 && result.errors.length === 0)
    result.fileErrors.push('The file has a header but no addresses');
  return result;
}

/** Row errors as an error-body `fields` map: "line 12" → messages (capped). */
export function csvErrorFields(errors: readonly CsvRowError[]): Record<string, string[]> {
  return Object.fromEntries(errors.slice(0, MAX_REPORTED_ROW_ERRORS).map((e) => [`line ${e.line}`, e.messages]));
}

export const GeocodeQuerySchema = z.object({
  q: z.string({ required_error: 'Type an address, postcode or coordinates' }).trim().min(2, 'Type at least 2 characters').max(200, 'At most 200 characters'),
  limit: intParam('limit', 1, 50, 10),
});
export type GeocodeQuery = z.output<typeof GeocodeQuerySchema>;

export const AddressListQuerySchema = z.object({
  q: searchParam,
  ...pageParams,
  /** Keyset paging: the `next` of the previous page (rows after it in label, id order); replaces offset. */
  after: z
    .string()
    .max(400, 'Not a page cursor')
    .regex(/^[A-Za-z0-9_-]+$/, 'Not a page cursor')
    .optional(),
});
export type AddressListQuery = z.output<typeof AddressListQuerySchema>;

// --- JSON the API returns ---------------------------------------------------------------

export interface GeocodeMatchJson {
  label: string;
  postcode: string | null;
  lat: number;
  lon: number;
  /** 0–1, higher is better; typed coordinates score 1. */
  score: number;
  kind: 'address' | 'coordinates';
}

/** A gazetteer address, field by field (imported from CSV, so nothing is written through a body). */
export const ADDRESS = defineRecord({
  id: field.id(),
  label: field.value<string>(),
  postcode: field.value<string | null>(),
  lat: field.value<number>({ sql: 'ST_Y({t}.geom)' }),
  lon: field.value<number>({ sql: 'ST_X({t}.geom)' }),
  source: field.value<string>(),
  updated_at: field.time(),
});

export type Address = ValueOf<typeof ADDRESS.fields>;
export type AddressJson = JsonOf<typeof ADDRESS.fields>;
export const addressJson = (a: Address): AddressJson => ADDRESS.toJson(a);

export interface AddressImportJson {
  rows: number;
  inserted: number;
  /** Known addresses whose label, postcode or position changed. */
  updated: number;
  /** Known addresses the file repeats exactly. */
  unchanged: number;
}
