// Customers: input schemas shared by the endpoints and the customer forms, and the JSON the
// API returns.
import { z } from 'zod';
import { PLAN_STATES, type PlanState } from '../domain/plan-state';
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

export const CustomerInputSchema = z
  .object({
    name,
    phone,
    email,
    address_label: addressLabel,
    postcode,
    lat,
    lon,
    current_operator_id: ref,
    current_antenna_id: ref,
    notes: optionalText(4000),
  })
  .transform((v) => ({
    name: v.name,
    phone: v.phone,
    email: v.email,
    addressLabel: v.address_label,
    postcode: v.postcode,
    lat: v.lat,
    lon: v.lon,
    currentOperatorId: v.current_operator_id,
    currentAntennaId: v.current_antenna_id,
    notes: v.notes,
  }));
export type CustomerInput = z.output<typeof CustomerInputSchema>;

export const CustomerChangeSchema = z
  .object({
    name: name.optional(),
    phone: phone.optional(),
    email: email.optional(),
    address_label: addressLabel.optional(),
    postcode: postcode.optional(),
    lat: lat.optional(),
    lon: lon.optional(),
    current_operator_id: IdRefSchema.nullable().optional(),
    current_antenna_id: IdRefSchema.nullable().optional(),
    notes: optionalText(4000).optional(),
    /** Required: the version the change was made from; a stale one is refused with 409. */
    row_version: RowVersionSchema,
  })
  .superRefine((v, ctx) => {
    if ((v.lat === undefined) !== (v.lon === undefined)) {
      ctx.addIssue({ code: 'custom', path: [v.lat === undefined ? 'lat' : 'lon'], message: 'Give latitude and longitude together' });
    }
    if (!hasChange(v)) ctx.addIssue({ code: 'custom', path: [], message: 'Nothing to change' });
  })
  .transform((v) => ({
    name: v.name,
    phone: v.phone,
    email: v.email,
    addressLabel: v.address_label,
    postcode: v.postcode,
    lat: v.lat,
    lon: v.lon,
    currentOperatorId: v.current_operator_id,
    currentAntennaId: v.current_antenna_id,
    notes: v.notes,
    rowVersion: v.row_version,
  }));
export type CustomerChange = Partial<z.output<typeof CustomerChangeSchema>>;

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

export interface CustomerJson {
  id: string;
  name: string;
  phone: string | null;
  email: string | null;
  address_label: string;
  postcode: string | null;
  lat: number;
  lon: number;
  current_operator_id: string | null;
  current_operator_name: string | null;
  current_antenna_id: string | null;
  current_antenna_name: string | null;
  notes: string | null;
  plan_count: number;
  /** State of the most recently changed plan, if any. */
  latest_plan_state: PlanState | null;
  created_at: string;
  updated_at: string;
  /** When the personal data was erased on the customer's request (null while it is held). */
  erased_at: string | null;
  row_version: number;
}

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
