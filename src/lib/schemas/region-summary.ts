// What a region holds: masts and cells by operator, technology and band, readings, newest
// sightings, and (for roles that may see customers) customers, plans by state and coverage gaps.
// The one declaration of the summary's shape: the endpoint checks its answer with it, the page
// renders the same type.
import { z } from 'zod';
import { MAST_STATUSES, TECHS } from './mast-enums';
import { PLAN_STATES } from '../domain/plan-state';
import { SIGNAL_GRADES, type SignalGrade } from '../domain/measurements';

const count = z.number().int().nonnegative();
const isoTime = z.string().datetime({ offset: true });
const tech = z.enum(TECHS);

const OperatorCountSchema = z.object({
  operator_id: z.string(),
  name: z.string(),
  colour: z.string(),
  masts: count,
  cells: count,
});

const TechCountSchema = z.object({ tech, masts: count, cells: count });

const BandCountSchema = z.object({
  tech,
  band: z.string(),
  /** Lowest downlink frequency of the band's cells here, for ordering and labels. */
  dl_mhz: z.number().nullable(),
  masts: count,
  cells: count,
});

const SightingRefSchema = z.object({
  id: z.string(),
  status: z.enum(['pending', 'approved', 'merged', 'rejected']),
  structure_type: z.string(),
  observed_at: isoTime,
  lat: z.number(),
  lon: z.number(),
  mast_id: z.string().nullable(),
});

const CoverageGapSchema = z.object({
  customer_id: z.string(),
  customer_name: z.string(),
  address_label: z.string(),
  plan_id: z.string(),
  plan_state: z.enum(PLAN_STATES),
  predicted_rsrp_dbm: z.number(),
  grade: z.enum(SIGNAL_GRADES as [SignalGrade, ...SignalGrade[]]),
  tech: z.string().nullable(),
  band: z.string().nullable(),
  mast_name: z.string().nullable(),
  operator_name: z.string().nullable(),
});

export const REGION_GAP_LIST_LIMIT = 50;
export const REGION_SIGHTING_LIST_LIMIT = 8;

export const RegionSummarySchema = z.object({
  region: z.object({
    id: z.string(),
    name: z.string(),
    area_km2: z.number(),
    /** [west, south, east, north] of the full outline. */
    bbox: z.tuple([z.number(), z.number(), z.number(), z.number()]),
  }),
  masts: z.object({
    total: count,
    by_status: z.object(Object.fromEntries(MAST_STATUSES.map((s) => [s, count])) as Record<(typeof MAST_STATUSES)[number], typeof count>),
  }),
  cells: z.object({
    total: count,
    by_operator: z.array(OperatorCountSchema),
    by_tech: z.array(TechCountSchema),
    by_band: z.array(BandCountSchema),
  }),
  readings: z.object({
    total: count,
    /** Matched to a cell by technology, channel and PCI. */
    matched: count,
    first_taken_at: isoTime.nullable(),
    last_taken_at: isoTime.nullable(),
    by_tech: z.array(z.object({ tech, count })),
    /** Whether readings taken at customers' homes (install checks) are counted: only for roles that may see customers. */
    includes_install_checks: z.boolean(),
  }),
  /** Newest first; reviewers see every sighting, others the decided ones and their own. */
  sightings: z.object({ total: count, newest: z.array(SightingRefSchema) }),
  /** Null for roles that may not see customers. */
  customers: z
    .object({
      total: count,
      without_plan: count,
      plans_by_state: z.object(Object.fromEntries(PLAN_STATES.map((s) => [s, count])) as Record<(typeof PLAN_STATES)[number], typeof count>),
      /** Customers with at least one predicted plan, and those with none yet. */
      predicted: count,
      not_predicted: count,
      gap_rule: z.string(),
      weak_below_rsrp_dbm: z.number(),
      gap_total: count,
      /** Weakest first, at most REGION_GAP_LIST_LIMIT. */
      gaps: z.array(CoverageGapSchema),
    })
    .nullable(),
});
export type RegionSummaryJson = z.infer<typeof RegionSummarySchema>;
export type CoverageGapJson = z.infer<typeof CoverageGapSchema>;
export type SightingRefJson = z.infer<typeof SightingRefSchema>;

/** One line of the region list: the key counts. */
export const RegionCountsSchema = z.object({
  id: z.string(),
  name: z.string(),
  area_km2: z.number(),
  masts: count,
  cells: count,
  readings: count,
  /** Null for roles that may not see customers. */
  customers: count.nullable(),
});
export type RegionCountsJson = z.infer<typeof RegionCountsSchema>;
