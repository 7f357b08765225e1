// Customers: the one field declaration, the input schemas derived from it (shared by the
// endpoints and the customer forms), and the JSON the API returns.
import { z } from 'zod';
import { PLAN_STATES, type PlanState } from '../domain/plan-state';
import { defineRecord, field, idOrNull, type ChangeOf, type InputOf, type JsonOf, type ValueOf } from './record';
import { IdRefSchema, enumOf, hasChange, numberField as num, optionalText, pageParams, requiredText, RowVersionSchema, searchParam } from './params';

const name = requiredText(120);
const phone = z
  .string()
  .trim()
  .refine((s) => s === '' || /^\+?[0-9 ()-]{5,30}$/.test(s), 'Digits, spaces, + ( ) - only, 5–30 characters')
  .nullish()
  .transform((s) => (s ? s : null));
const email = z
  .string()
  .trim()
  .refine((s) => s === '' || z.string().email().max(254).safeParse(s).success, 'Enter a valid e-mail address')
  .nullish()
  .transform((s) => (s ? s.toLowerCase() : null));
const addressLabel = requiredText(300);
const postcode = z
  .string()
  .trim()
  .max(12, 'At most 12 characters')
  .nullish()
  .transform((s) => (s ? s.toUpperCase().replace(/\s+/g, ' ') : null));
const lat = num('Latitude').min(-90, 'Latitude must be between -90 and 90').max(90, 'Latitude must be between -90 and 90');
const lon = num('Longitude').min(-180, 'Longitude must be between -180 and 180').max(180, 'Longitude must be between -180 and 180');
const ref = IdRefSchema.nullish().transform((v) => v ?? null);

/** A customer, field by field: body and JSON name (= column), how it is written, read and audited. */
export const CUSTOMER = defineRecord({
  id: field.id(),
  name: field.input(name),
  phone: field.input(phone),
  email: field.input(email),
  address_label: field.input(addressLabel),
  postcode: field.input(postcode),
  // The place is stored as one point (`geom`): the repo writes it from lat and lon together.
  lat: field.input(lat, { column: false, sql: 'ST_Y({t}.geom)' }),
  lon: field.input(lon, { column: false, sql: 'ST_X({t}.geom)' }),
  current_operator_id: field.input(ref, { fromRow: idOrNull }),
  // Names of the referenced rows: selected with the operator joined as `o` and the antenna as `a`.
  current_operator_name: field.value<string | null>({ sql: 'o.name' }),
  current_antenna_id: field.input(ref, { fromRow: idOrNull }),
  current_antenna_name: field.value<string | null>({ sql: 'a.name' }),
  notes: field.input(optionalText(4000)),
  plan_count: field.count({ sql: '(SELECT count(*) FROM plans p WHERE p.customer_id = {t}.id)' }),
  /** State of the most recently changed plan, if any. */
  latest_plan_state: field.value<PlanState | null>({
    sql: '(SELECT p.state FROM plans p WHERE p.customer_id = {t}.id ORDER BY p.updated_at DESC, p.id DESC LIMIT 1)',
  }),
  created_at: field.time(),
  updated_at: field.time(),
  /** When the personal data was erased on the customer's request (null while it is held). */
  erased_at: field.maybeTime(),
  row_version: field.value<number>(),
});

export type Customer = ValueOf<typeof CUSTOMER.fields>;
export type CustomerJson = JsonOf<typeof CUSTOMER.fields>;
export type CustomerInput = InputOf<typeof CUSTOMER.fields>;
export type CustomerChange = Partial<ChangeOf<typeof CUSTOMER.fields> & { rowVersion: number }>;

export const customerJson = (c: Customer): CustomerJson => CUSTOMER.toJson(c);

export const CustomerInputSchema = z.object(CUSTOMER.inputShape).transform((v): CustomerInput => CUSTOMER.toInput(v));

export const CustomerChangeSchema = z
  .object({
    ...CUSTOMER.changeShape,
    /** Required: the version the change was made from; a stale one is refused with 409. */
    row_version: RowVersionSchema,
  })
  .superRefine((v, ctx) => {
    if ((v.lat === undefined) !== (v.lon === undefined)) {
      ctx.addIssue({ code: 'custom', path: [v.lat === undefined ? 'lat' : 'lon'], message: 'Give latitude and longitude together' });
    }
    if (!hasChange(v)) ctx.addIssue({ code: 'custom', path: [], message: 'Nothing to change' });
  })
  .transform((v): CustomerChange => ({ ...CUSTOMER.toChange(v), rowVersion: v.row_version }));

export const CUSTOMER_SORTS = ['name', 'address', 'postcode', 'state', 'created_at', 'updated_at'] as const;
export type CustomerSort = (typeof CUSTOMER_SORTS)[number];

export const CustomerListQuerySchema = z.object({
  q: searchParam,
  /** Customers with at least one plan in this state. */
  state: enumOf(PLAN_STATES).optional(),
  sort: z.enum(CUSTOMER_SORTS, { errorMap: () => ({ message: `Sort by one of: ${CUSTOMER_SORTS.join(', ')}` }) }).default('updated_at'),
  dir: z.enum(['asc', 'desc'], { errorMap: () => ({ message: 'Choose asc or desc' }) }).optional(),
  ...pageParams,
});
export type CustomerListQuery = z.output<typeof CustomerListQuerySchema>;

// --- JSON the API returns ---------------------------------------------------------------

/** Answer of POST /api/customers/:id/erasure: the erased customer and what else was cleared. */
export interface CustomerErasureJson {
  customer: CustomerJson;
  plans_anonymised: number;
  install_checks_cleared: number;
  install_readings_removed: number;
  audit_entries_scrubbed: number;
}

export interface HistoryEntryJson {
  id: string;
  at: string;
  user_id: string | null;
  user_name: string | null;
  action: string;
  entity: 'customer' | 'plan';
  entity_id: string;
  changes: { field: string; before: unknown; after: unknown }[];
  details: Record<string, unknown> | null;
}
