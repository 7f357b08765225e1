// The review queue and a reviewer's decision on a sighting: schemas shared by the endpoint and
// the review page, and the JSON shapes the API returns.
import { z } from 'zod';
import { MAST_PLACE, type Cell, type CellJson, type Mast, type MastJson, type MastPlace, type MastPlaceJson } from './masts';
import { cellJson, mastJson } from './mast-responses';
import { sightingJson, type Sighting, type SightingJson } from './sightings';
import { IdRefSchema, enumOf, optionalText, pageParams } from './params';

export const DECISIONS = ['approve', 'merge', 'reject'] as const;
export type Decision = (typeof DECISIONS)[number];

export const DECISION_LABELS: Record<Decision, string> = {
  approve: 'Approve as a new mast',
  merge: 'Merge into a mast',
  reject: 'Reject',
};

export const DecisionSchema = z
  .object({
    decision: enumOf(DECISIONS),
    mast_id: IdRefSchema.nullish(),
    reason: optionalText(1000),
    /** The new mast's name when approving; a name is made up when left out. */
    name: optionalText(120),
  })
  .superRefine((v, ctx) => {
    if (v.decision === 'merge' && !v.mast_id) ctx.addIssue({ code: 'custom', path: ['mast_id'], message: 'Choose the mast to merge into' });
    if (v.decision !== 'merge' && v.mast_id) ctx.addIssue({ code: 'custom', path: ['mast_id'], message: 'Only a merge names a mast' });
    if (v.decision === 'reject' && (!v.reason || v.reason.length < 3)) {
      ctx.addIssue({ code: 'custom', path: ['reason'], message: 'Say why, so the surveyor can learn from it' });
    }
    if (v.decision !== 'approve' && v.name) ctx.addIssue({ code: 'custom', path: ['name'], message: 'Only an approval names a new mast' });
  })
  .transform((v) => ({ decision: v.decision, mastId: v.mast_id ?? null, reason: v.reason, name: v.name }));
export type DecisionInput = z.output<typeof DecisionSchema>;
export type DecisionBody = z.input<typeof DecisionSchema>;

export const ReviewQueueQuerySchema = z.object({ ...pageParams });

// --- JSON ------------------------------------------------------------------------------------------

/** How a submitter's earlier sightings fared (the same in JSON). */
export interface SubmitterRecord {
  approved: number;
  merged: number;
  rejected: number;
  pending: number;
}
export type SubmitterRecordJson = SubmitterRecord;

export type CandidateMastJson = MastPlaceJson;

/** An existing mast near the sighting that it may duplicate. */
export interface DuplicateCandidateJson {
  mast: CandidateMastJson;
  distance_m: number;
  shared_cells: number;
  cells: CellJson[];
}

export interface ReviewItemJson {
  sighting: SightingJson;
  submitter: SubmitterRecordJson;
  candidates: DuplicateCandidateJson[];
}

export interface ReviewQueueJson {
  items: ReviewItemJson[];
  total: number;
  radius_m: number;
}

export interface DecisionResultJson {
  sighting: SightingJson;
  /** The new mast (approve) or the mast merged into (merge). */
  mast: MastJson | null;
  added_cells: number;
  observed_cells: number;
}

// --- Records and their JSON ------------------------------------------------------------------------

/** An existing mast near a sighting, as the repo reads it. */
export interface DuplicateCandidate {
  mast: MastPlace;
  distanceM: number;
  sharedCells: number;
  cells: Cell[];
}

export interface ReviewItem {
  sighting: Sighting;
  submitter: SubmitterRecord;
  candidates: DuplicateCandidate[];
}

/** What a decision did: the sighting as decided, the mast made or merged into, the cells added and confirmed. */
export interface DecisionResult {
  sighting: Sighting;
  mast: Mast | null;
  addedCells: Cell[];
  observedCells: number;
}

export const duplicateCandidateJson = (c: DuplicateCandidate): DuplicateCandidateJson => ({
  mast: MAST_PLACE.toJson(c.mast),
  distance_m: Math.round(c.distanceM * 10) / 10,
  shared_cells: c.sharedCells,
  cells: c.cells.map(cellJson),
});

/** A reviewer sees the photos' originals. */
export const reviewItemJson = (i: ReviewItem): ReviewItemJson => ({
  sighting: sightingJson(i.sighting, { withOriginals: true }),
  submitter: i.submitter,
  candidates: i.candidates.map(duplicateCandidateJson),
});

export const reviewQueueJson = (queue: { items: ReviewItem[]; total: number }, radiusM: number): ReviewQueueJson => ({
  items: queue.items.map(reviewItemJson),
  total: queue.total,
  radius_m: radiusM,
});

export const decisionResultJson = (r: DecisionResult): DecisionResultJson => ({
  sighting: sightingJson(r.sighting, { withOriginals: true }),
  mast: r.mast ? mastJson(r.mast) : null,
  added_cells: r.addedCells.length,
  observed_cells: r.observedCells,
});
