// Plans and install checks: input schemas shared by the endpoints and the planner forms, and
// the JSON the API returns.
import { z } from 'zod';
import { PLAN_STATES, type PlanState } from '../domain/plan-state';
import { CustomerInputSchema } from './customers';
import type { ShortlistItemJson } from './shortlist';
import { ID_PATTERN, IdRefSchema, dateField, dateTimeField, enumOf, hasChange, numberField as num, optionalText, pageParams, RowVersionSchema } from './params';

const stateEnum = enumOf(PLAN_STATES);
const ref = IdRefSchema.nullable();
const cableM = num('Cable length').min(0, 'Cable length cannot be negative').max(200, 'Cable length must be at most 200 m');
const mountHeightM = num('Mount height').min(0, 'Mount height cannot be negative').max(100, 'Mount height must be at most 100 m');
const date = dateField.nullable();

/** The chosen cell and kit and the visit date: the same fields in a new plan and in a change. */
const kitFields = {
  cell_id: ref.optional(),
  antenna_id: ref.optional(),
  cable_id: ref.optional(),
  cable_m: cableM.nullable().optional(),
  mount_height_m: mountHeightM.nullable().optional(),
  scheduled_for: date.optional(),
};

export const PlanInputSchema = z
  .object({
    // An existing customer, or a new one saved in the same transaction as the plan.
    customer_id: IdRefSchema.optional(),
    customer: CustomerInputSchema.optional(),
    ...kitFields,
    notes: optionalText(4000),
    // A plan starts as an enquiry, or as planned when the planner saves a chosen cell and kit.
    state: z.enum(['enquiry', 'planned'], { errorMap: () => ({ message: 'A new plan starts as enquiry or planned' }) }).default('enquiry'),
  })
  .superRefine((v, ctx) => {
    if (!v.customer_id && !v.customer) ctx.addIssue({ code: 'custom', path: ['customer_id'], message: 'Choose a customer or enter a new one' });
    if (v.customer_id && v.customer) ctx.addIssue({ code: 'custom', path: ['customer'], message: 'Give an existing customer or a new one, not both' });
  })
  .transform((v) => ({
    customerId: v.customer_id ?? null,
    newCustomer: v.customer ?? null,
    cellId: v.cell_id ?? null,
    antennaId: v.antenna_id ?? null,
    cableId: v.cable_id ?? null,
    cableM: v.cable_m ?? null,
    mountHeightM: v.mount_height_m ?? null,
    scheduledFor: v.scheduled_for ?? null,
    notes: v.notes,
    state: v.state as PlanState,
  }));
export type PlanInput = z.output<typeof PlanInputSchema>;

export const PlanChangeSchema = z
  .object({
    ...kitFields,
    notes: optionalText(4000).optional(),
    state: stateEnum.optional(),
    /** Required: the version the change was made from; a stale one is refused with 409. */
    row_version: RowVersionSchema,
  })
  .superRefine((v, ctx) => {
    if (!hasChange(v)) ctx.addIssue({ code: 'custom', path: [], message: 'Nothing to change' });
  })
  .transform((v) => ({
    cellId: v.cell_id,
    antennaId: v.antenna_id,
    cableId: v.cable_id,
    cableM: v.cable_m,
    mountHeightM: v.mount_height_m,
    scheduledFor: v.scheduled_for,
    notes: v.notes,
    state: v.state,
    rowVersion: v.row_version,
  }));
export type PlanChange = Partial<z.output<typeof PlanChangeSchema>>;

export const PlanListQuerySchema = z.object({
  customer_id: z.string().trim().regex(ID_PATTERN, 'Not a valid id').optional(),
  state: stateEnum.optional(),
  ...pageParams,
});
export type PlanListQuery = z.output<typeof PlanListQuerySchema>;

// --- install checks -------------------------------------------------------------------------

export const CHECK_PHASES = ['before', 'after'] as const;
export type CheckPhase = (typeof CHECK_PHASES)[number];

// Plausibility limits: the widest reporting ranges of 3GPP TS 36.133 / 38.133 (LTE RSRP
// −156…−44 dBm extended, NR SS-RSRP to −31 dBm; RSRQ −43…20 dB; SINR −23…40 dB): TS 36.133
// §9.1.4 / §9.1.7, TS 38.133 §10.1.6 / §10.1.11 / §10.1.16.
const CheckReadingSchema = z.object({
  pci: num('PCI').int('PCI must be a whole number').min(0, 'PCI must be 0–1007').max(1007, 'PCI must be 0–1007'),
  channel: num('Channel')
    .int('Channel must be a whole number')
    .min(0, 'Channel cannot be negative')
    .nullish()
    .transform((v) => v ?? null),
  rsrp_dbm: num('RSRP').min(-156, 'RSRP must be between −156 and −31 dBm').max(-31, 'RSRP must be between −156 and −31 dBm'),
  rsrq_db: num('RSRQ')
    .min(-43, 'RSRQ must be between −43 and 20 dB')
    .max(20, 'RSRQ must be between −43 and 20 dB')
    .nullish()
    .transform((v) => v ?? null),
  sinr_db: num('SINR')
    .min(-23, 'SINR must be between −23 and 40 dB')
    .max(40, 'SINR must be between −23 and 40 dB')
    .nullish()
    .transform((v) => v ?? null),
});

const SpeedTestSchema = z.object({
  down_mbps: num('Download').min(0, 'Cannot be negative').max(10_000, 'At most 10000 Mbit/s'),
  up_mbps: num('Upload').min(0, 'Cannot be negative').max(10_000, 'At most 10000 Mbit/s'),
  latency_ms: num('Latency')
    .min(0, 'Cannot be negative')
    .max(10_000, 'At most 10000 ms')
    .nullish()
    .transform((v) => v ?? null),
});

export const InstallCheckInputSchema = z
  .object({
    phase: z.enum(CHECK_PHASES, { errorMap: () => ({ message: 'Choose before or after' }) }),
    taken_at: dateTimeField.optional(),
    notes: optionalText(2000),
    readings: z.array(CheckReadingSchema).max(64, 'At most 64 readings').default([]),
    speed_tests: z.array(SpeedTestSchema).max(20, 'At most 20 speed tests').default([]),
  })
  .superRefine((v, ctx) => {
    if (v.readings.length === 0 && v.speed_tests.length === 0) {
      ctx.addIssue({ code: 'custom', path: ['readings'], message: 'Add at least one reading or speed test' });
    }
  })
  .transform((v) => ({
    phase: v.phase,
    takenAt: v.taken_at ?? null,
    notes: v.notes,
    readings: v.readings.map((r) => ({ pci: r.pci, channel: r.channel, rsrpDbm: r.rsrp_dbm, rsrqDb: r.rsrq_db, sinrDb: r.sinr_db })),
    speedTests: v.speed_tests.map((t) => ({ downMbps: t.down_mbps, upMbps: t.up_mbps, latencyMs: t.latency_ms })),
  }));
export type InstallCheckInput = z.output<typeof InstallCheckInputSchema>;

// --- JSON the API returns ---------------------------------------------------------------

/**
 * What the server predicted for the plan's cell and kit when they were last saved: the shortlist
 * row of that cell, the position and the kit it was computed for. Empty for a plan without a cell.
 */
export interface PlanFiguresJson extends ShortlistItemJson {
  customer_position?: { lat: number; lon: number };
  kit?: { antenna_id: string | null; cable_id: string | null; cable_m: number | null; mount_height_m: number | null };
  computed_at?: string;
}
export type PlanFiguresFieldJson = PlanFiguresJson | Record<string, never>;

export function hasFigures(f: PlanFiguresFieldJson | null | undefined): f is PlanFiguresJson {
  return !!f && typeof (f as PlanFiguresJson).predicted_rsrp_dbm === 'number';
}

export interface PlanCellJson {
  id: string;
  mast_id: string;
  mast_name: string;
  operator_id: string;
  operator_name: string;
  tech: string;
  band: string;
  channel: number;
  dl_mhz: number | null;
  pci: number | null;
  sector_azimuth_deg: number | null;
  lat: number;
  lon: number;
}

export interface PlanJson {
  id: string;
  customer_id: string;
  customer_name: string;
  state: PlanState;
  /** States this plan may move to next (forward first, then back). */
  next_states: PlanState[];
  cell_id: string | null;
  cell: PlanCellJson | null;
  antenna_id: string | null;
  antenna_name: string | null;
  cable_id: string | null;
  cable_name: string | null;
  cable_m: number | null;
  mount_height_m: number | null;
  figures: PlanFiguresFieldJson;
  scheduled_for: string | null;
  notes: string | null;
  created_by: string | null;
  created_by_name: string | null;
  created_at: string;
  updated_at: string;
  state_changed_at: string;
  row_version: number;
}

export interface InstallCheckJson {
  id: string;
  plan_id: string;
  phase: CheckPhase;
  taken_at: string;
  notes: string | null;
  created_by: string | null;
  created_by_name: string | null;
  created_at: string;
  readings: { pci: number; channel: number | null; rsrp_dbm: number; rsrq_db: number | null; sinr_db: number | null }[];
  speed_tests: { down_mbps: number; up_mbps: number; latency_ms: number | null }[];
}

export interface MeasuredGainJson {
  pci: number;
  channel: number | null;
  samples_before: number;
  samples_after: number;
  before_rsrp_dbm: number | null;
  after_rsrp_dbm: number | null;
  measured_gain_db: number | null;
  predicted_gain_db: number | null;
  difference_db: number | null;
  before_sinr_db: number | null;
  after_sinr_db: number | null;
  sinr_change_db: number | null;
}

export interface SpeedSummaryJson {
  tests: number;
  down_mbps: number | null;
  up_mbps: number | null;
  latency_ms: number | null;
}

export interface PlanResultJson {
  /** Latest check of each phase that the comparison uses. */
  before_check_id: string | null;
  after_check_id: string | null;
  /** RSRP the planner predicted with the chosen kit (figures.predicted_rsrp_dbm). */
  predicted_rsrp_dbm: number | null;
  /** Downlink rate the planner expected (figures.expected_throughput_mbps), to compare with the speed tests. */
  expected_throughput_mbps: number | null;
  gains: MeasuredGainJson[];
  speed_before: SpeedSummaryJson;
  speed_after: SpeedSummaryJson;
}

export interface PlanDetailJson extends PlanJson {
  checks: InstallCheckJson[];
  result: PlanResultJson;
}

/** POST /api/plans/:id/installed: the installer marks the antenna up, from the version they saw. */
export const PlanInstalledSchema = z.object({ row_version: RowVersionSchema }).transform((v) => ({ rowVersion: v.row_version }));
