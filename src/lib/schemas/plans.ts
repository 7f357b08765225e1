// Plans and install checks: one field declaration each, the input schemas derived from it (shared
// by the endpoints and the planner forms), and the JSON the API returns.
import { z } from 'zod';
import { getAllowedTransitions, PLAN_STATES, type MeasuredGain, type PlanState, type SpeedSummary } from '../domain/plan-state';
import { CustomerInputSchema } from './customers';
import { CELL, CELL_RADIO } from './masts';
import type { ShortlistItemJson } from './shortlist';
import { defineRecord, field, idOrNull, orNull, type Fields, type JsonOf, type RecordDeclaration, type ValueOf } from './record';
import { ID_PATTERN, IdRefSchema, dateField, dateTimeField, enumOf, hasChange, numberField as num, optionalText, pageParams, RowVersionSchema } from './params';

const stateEnum = enumOf(PLAN_STATES);
const ref = IdRefSchema.nullish().transform(orNull);
const cableM = num('Cable length').min(0, 'Cable length cannot be negative').max(200, 'Cable length must be at most 200 m');
const mountHeightM = num('Mount height').min(0, 'Mount height cannot be negative').max(100, 'Mount height must be at most 100 m');

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

/** The plan's cell as the plan shows it: the cell's own fields, its mast and operator. Selected inside a plan. */
export const PLAN_CELL = defineRecord({
  id: CELL.fields.id,
  mast_id: CELL.fields.mast_id,
  mast_name: field.value<string>({ sql: 'm.name' }),
  operator_id: field.id(),
  operator_name: field.value<string>({ sql: 'o.name' }),
  ...CELL_RADIO,
  lat: field.value<number>({ sql: 'ST_Y(m.geom)' }),
  lon: field.value<number>({ sql: 'ST_X(m.geom)' }),
});
export type PlanCell = ValueOf<typeof PLAN_CELL.fields>;
export type PlanCellJson = JsonOf<typeof PLAN_CELL.fields>;

/**
 * A plan, field by field: body and JSON name (= column), how it is written, read and audited.
 * Selected with the customer joined as `cu`, the cell as `ce` (its mast `m`, operator `o`), the
 * antenna `a`, the cable `cb` and the author `u`. The customer and the state have their own rules
 * in the create and change bodies below.
 */
export const PLAN = defineRecord({
  id: field.id(),
  customer_id: field.id({ audit: true, write: true }),
  customer_name: field.value<string>({ sql: 'cu.name' }),
  state: field.value<PlanState>({ audit: true, write: true }),
  // The chosen cell and kit and the visit date: the same fields in a new plan and in a change.
  cell_id: field.input(ref, { fromRow: idOrNull }),
  cell: field.value<PlanCell | null, PlanCellJson | null>({
    sql: `CASE WHEN m.id IS NULL THEN NULL ELSE ${PLAN_CELL.objectSql('ce')} END`,
    fromRow: (v) => (v ? PLAN_CELL.fromRow(v as Record<string, unknown>) : null),
    toJson: (c) => c && PLAN_CELL.toJson(c),
  }),
  antenna_id: field.input(ref, { fromRow: idOrNull }),
  antenna_name: field.value<string | null>({ sql: 'a.name' }),
  cable_id: field.input(ref, { fromRow: idOrNull }),
  cable_name: field.value<string | null>({ sql: 'cb.name' }),
  cable_m: field.input(cableM.nullish().transform(orNull)),
  mount_height_m: field.input(mountHeightM.nullish().transform(orNull)),
  // Computed by the server from the cell and kit (plan-service.ts).
  figures: field.value<PlanFiguresFieldJson>({ audit: true, write: true, fromRow: (v) => (v ?? {}) as PlanFiguresFieldJson, toRow: (f) => JSON.stringify(f) }),
  scheduled_for: field.input(dateField.nullish().transform(orNull), { sql: "to_char({t}.scheduled_for, 'YYYY-MM-DD')" }),
  notes: field.input(optionalText(4000)),
  created_by: field.ref(),
  created_by_name: field.value<string | null>({ sql: 'u.name' }),
  created_at: field.time(),
  updated_at: field.time(),
  state_changed_at: field.time(),
  row_version: field.value<number>(),
});

export type Plan = ValueOf<typeof PLAN.fields>;
export type PlanJson = JsonOf<typeof PLAN.fields> & {
  /** States this plan may move to next (forward first, then back). */
  next_states: PlanState[];
};

export function planJson(p: Plan): PlanJson {
  const { id, customer_id, customer_name, state, ...rest } = PLAN.toJson(p);
  return { id, customer_id, customer_name, state, next_states: getAllowedTransitions(p.state), ...rest };
}

export const PlanInputSchema = z
  .object({
    // An existing customer, or a new one saved in the same transaction as the plan.
    customer_id: IdRefSchema.optional(),
    customer: CustomerInputSchema.optional(),
    ...PLAN.inputShape,
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
    ...PLAN.toInput(v),
    state: v.state as PlanState,
  }));
export type PlanInput = z.output<typeof PlanInputSchema>;

export const PlanChangeSchema = z
  .object({
    ...PLAN.changeShape,
    state: stateEnum.optional(),
    /** Required: the version the change was made from; a stale one is refused with 409. */
    row_version: RowVersionSchema,
  })
  .superRefine((v, ctx) => {
    if (!hasChange(v)) ctx.addIssue({ code: 'custom', path: [], message: 'Nothing to change' });
  })
  .transform((v) => ({ ...PLAN.toChange(v), state: v.state, rowVersion: v.row_version }));
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
/** One reading of an install check; stored in `install_check_readings`. */
export const CHECK_READING = defineRecord({
  pci: field.input(num('PCI').int('PCI must be a whole number').min(0, 'PCI must be 0–1007').max(1007, 'PCI must be 0–1007')),
  channel: field.input(num('Channel').int('Channel must be a whole number').min(0, 'Channel cannot be negative').nullish().transform(orNull)),
  rsrp_dbm: field.input(num('RSRP').min(-156, 'RSRP must be between −156 and −31 dBm').max(-31, 'RSRP must be between −156 and −31 dBm')),
  rsrq_db: field.input(num('RSRQ').min(-43, 'RSRQ must be between −43 and 20 dB').max(20, 'RSRQ must be between −43 and 20 dB').nullish().transform(orNull)),
  sinr_db: field.input(num('SINR').min(-23, 'SINR must be between −23 and 40 dB').max(40, 'SINR must be between −23 and 40 dB').nullish().transform(orNull)),
});

/** One speed test of an install check; stored in `install_check_speed_tests`. */
export const SPEED_TEST = defineRecord({
  down_mbps: field.input(num('Download').min(0, 'Cannot be negative').max(10_000, 'At most 10000 Mbit/s')),
  up_mbps: field.input(num('Upload').min(0, 'Cannot be negative').max(10_000, 'At most 10000 Mbit/s')),
  latency_ms: field.input(num('Latency').min(0, 'Cannot be negative').max(10_000, 'At most 10000 ms').nullish().transform(orNull)),
});

/** A list of child rows read with the check (json_agg in id order) and written by the repo. */
function childRows<F extends Fields>(record: RecordDeclaration<F>, table: string, max: number, message: string) {
  const row = z.object(record.inputShape as z.ZodRawShape).transform((v) => record.toInput(v) as unknown as ValueOf<F>);
  return field.input(z.array(row).max(max, message).default([]), {
    column: false,
    sql: `(SELECT coalesce(json_agg(${record.objectSql('r')} ORDER BY r.id), '[]'::json) FROM ${table} r WHERE r.check_id = {t}.id)`,
    fromRow: (v) => (v as Record<string, unknown>[]).map((r) => record.fromRow(r)),
    toJson: (rows: ValueOf<F>[]) => rows.map((r) => record.toJson(r)),
  });
}

/** An install check, field by field. Selected with its author joined as `u`. */
export const INSTALL_CHECK = defineRecord({
  id: field.id(),
  plan_id: field.id(),
  phase: field.input(z.enum(CHECK_PHASES, { errorMap: () => ({ message: 'Choose before or after' }) })),
  // Left out: the time the server received the check.
  taken_at: field.input(dateTimeField.optional(), { fromRow: (v) => v as Date, toJson: (d: Date) => d.toISOString() }),
  notes: field.input(optionalText(2000)),
  created_by: field.ref(),
  created_by_name: field.value<string | null>({ sql: 'u.name' }),
  created_at: field.time(),
  readings: childRows(CHECK_READING, 'install_check_readings', 64, 'At most 64 readings'),
  speed_tests: childRows(SPEED_TEST, 'install_check_speed_tests', 20, 'At most 20 speed tests'),
});

export type InstallCheck = ValueOf<typeof INSTALL_CHECK.fields>;
export type InstallCheckJson = JsonOf<typeof INSTALL_CHECK.fields>;
export const installCheckJson = (c: InstallCheck): InstallCheckJson => INSTALL_CHECK.toJson(c);

export const InstallCheckInputSchema = z
  .object(INSTALL_CHECK.inputShape)
  .superRefine((v, ctx) => {
    if (v.readings.length === 0 && v.speed_tests.length === 0) {
      ctx.addIssue({ code: 'custom', path: ['readings'], message: 'Add at least one reading or speed test' });
    }
  })
  .transform((v) => ({ ...INSTALL_CHECK.toInput(v), takenAt: v.taken_at ?? null }));
export type InstallCheckInput = z.output<typeof InstallCheckInputSchema>;

// --- JSON the API returns ---------------------------------------------------------------

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

/** Measured against predicted (repos/plans.ts `getPlanResult`). */
export interface PlanResult {
  beforeCheckId: string | null;
  afterCheckId: string | null;
  predictedRsrpDbm: number | null;
  expectedThroughputMbps: number | null;
  gains: MeasuredGain[];
  speedBefore: SpeedSummary;
  speedAfter: SpeedSummary;
}

export interface PlanDetail extends Plan {
  checks: InstallCheck[];
  result: PlanResult;
}

const speedJson = (s: SpeedSummary): SpeedSummaryJson => ({ tests: s.tests, down_mbps: s.downMbps, up_mbps: s.upMbps, latency_ms: s.latencyMs });

export function planDetailJson(p: PlanDetail): PlanDetailJson {
  return {
    ...planJson(p),
    checks: p.checks.map(installCheckJson),
    result: {
      before_check_id: p.result.beforeCheckId,
      after_check_id: p.result.afterCheckId,
      predicted_rsrp_dbm: p.result.predictedRsrpDbm,
      expected_throughput_mbps: p.result.expectedThroughputMbps,
      gains: p.result.gains.map((g) => ({
        pci: g.pci,
        channel: g.channel,
        samples_before: g.samplesBefore,
        samples_after: g.samplesAfter,
        before_rsrp_dbm: g.beforeRsrpDbm,
        after_rsrp_dbm: g.afterRsrpDbm,
        measured_gain_db: g.measuredGainDb,
        predicted_gain_db: g.predictedGainDb,
        difference_db: g.differenceDb,
        before_sinr_db: g.beforeSinrDb,
        after_sinr_db: g.afterSinrDb,
        sinr_change_db: g.sinrChangeDb,
      })),
      speed_before: speedJson(p.result.speedBefore),
      speed_after: speedJson(p.result.speedAfter),
    },
  };
}

/** POST /api/plans/:id/installed: the installer marks the antenna up, from the version they saw. */
export const PlanInstalledSchema = z.object({ row_version: RowVersionSchema }).transform((v) => ({ rowVersion: v.row_version }));
