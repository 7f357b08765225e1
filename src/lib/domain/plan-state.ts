/**
 * A plan's life: enquiry → planned → scheduled → installed → verified, the facts each step
 * needs, who may see and change plans, and the measured result of an install (before/after
 * readings per PCI against the predicted gain; the prediction is Bearline's own model in shortlist.ts).
 */
import { can, type Permission, type Role } from './roles';
import { defineChoices, type Choice } from './choices';

export const PLAN_STATE = defineChoices({
  enquiry: 'Enquiry',
  planned: 'Planned',
  scheduled: 'Scheduled',
  installed: 'Installed',
  verified: 'Verified',
});
export const { values: PLAN_STATES, labels: PLAN_STATE_LABELS, is: isPlanState } = PLAN_STATE;
export type PlanState = Choice<typeof PLAN_STATE>;

// One step forward at a time. Back-steps cover the usual turns of a job: the customer wants
// another option (planned → enquiry), the visit is called off (scheduled → planned), the
// install was recorded too early or has to be redone (installed → scheduled), and the
// checks were wrong or incomplete (verified → installed).
const NEXT: Record<PlanState, PlanState | null> = {
  enquiry: 'planned',
  planned: 'scheduled',
  scheduled: 'installed',
  installed: 'verified',
  verified: null,
};
const BACK: Record<PlanState, PlanState | null> = {
  enquiry: null,
  planned: 'enquiry',
  scheduled: 'planned',
  installed: 'scheduled',
  verified: 'installed',
};

export function getAllowedTransitions(from: PlanState): PlanState[] {
  return [NEXT[from], BACK[from]].filter((s): s is PlanState => s !== null);
}

export function isAllowedTransition(from: PlanState, to: PlanState): boolean {
  return getAllowedTransitions(from).includes(to);
}

/** What a plan holds when a transition is asked for (after the same request's other changes). */
export interface PlanFacts {
  cellId: string | null;
  antennaId: string | null;
  cableId: string | null;
  cableM: number | null;
  mountHeightM: number | null;
  scheduledFor: string | null;
  afterCheckCount: number;
}

export type FieldProblems = Record<string, string[]>;

export type TransitionCheck =
  { ok: true } | { ok: false; reason: 'forbidden'; message: string } | { ok: false; reason: 'incomplete'; message: string; fields: FieldProblems };

/** What a plan must hold to be in `state` (a forward step checks the target state). */
export function getMissingFacts(state: PlanState, facts: PlanFacts): FieldProblems {
  const missing: FieldProblems = {};
  const rank = PLAN_STATES.indexOf(state);
  if (rank >= PLAN_STATES.indexOf('planned')) {
    if (facts.cellId === null) missing.cell_id = ['Choose the cell to aim at'];
    if (facts.antennaId === null) missing.antenna_id = ['Choose an antenna'];
    if (facts.cableId === null) missing.cable_id = ['Choose a cable'];
    if (facts.cableM === null) missing.cable_m = ['Enter the cable length'];
    if (facts.mountHeightM === null) missing.mount_height_m = ['Enter the mount height'];
  }
  if (rank >= PLAN_STATES.indexOf('scheduled') && facts.scheduledFor === null) {
    missing.scheduled_for = ['Set the install date'];
  }
  if (rank >= PLAN_STATES.indexOf('verified') && facts.afterCheckCount === 0) {
    missing.checks = ['Record an after-install check first'];
  }
  return missing;
}

export function checkTransition(from: PlanState, to: PlanState, facts: PlanFacts): TransitionCheck {
  if (from === to) return { ok: true };
  if (!isAllowedTransition(from, to)) {
    const allowed = getAllowedTransitions(from).map((s) => PLAN_STATE_LABELS[s].toLowerCase());
    return {
      ok: false,
      reason: 'forbidden',
      message: `A plan cannot go from ${from} to ${to}; from ${from} it can go to ${allowed.join(' or ')}`,
    };
  }
  // Back-steps never need more facts than the state they leave.
  if (BACK[from] === to) return { ok: true };
  const missing = getMissingFacts(to, facts);
  if (Object.keys(missing).length > 0) {
    return { ok: false, reason: 'incomplete', message: `The plan is not ready to be ${to}`, fields: missing };
  }
  return { ok: true };
}

/** Cell and kit are fixed once the antenna is up; step back to scheduled to change them. */
export function isKitLocked(state: PlanState): boolean {
  return state === 'installed' || state === 'verified';
}

/** After-install readings only make sense once the antenna is up. */
export function getCheckPhaseProblem(state: PlanState, phase: 'before' | 'after'): string | null {
  if (phase === 'after' && !isKitLocked(state)) return `Mark the plan installed before recording an after-install check (it is ${state})`;
  return null;
}

// Customer records hold personal contact details: planners and admins work with them;
// surveyors see them to carry out installs and record checks; reviewers and contributors
// have no need to.
export function canViewPlans(role: Role | null | undefined): boolean {
  return can(role, 'plans:view');
}

export function canWritePlans(role: Role | null | undefined): boolean {
  return can(role, 'plans:write');
}

/** Planners record install checks with the plan, surveyors as readings in the field. */
export const RECORD_CHECKS_PERMISSIONS: readonly Permission[] = ['plans:write', 'readings:write'];

export function canRecordChecks(role: Role | null | undefined): boolean {
  return RECORD_CHECKS_PERMISSIONS.some((p) => can(role, p));
}

/** Whoever records the install checks may also mark the antenna up (scheduled → installed). */
export const MARK_INSTALLED_PERMISSIONS: readonly Permission[] = RECORD_CHECKS_PERMISSIONS;

export function canMarkInstalled(role: Role | null | undefined): boolean {
  return MARK_INSTALLED_PERMISSIONS.some((p) => can(role, p));
}

// --- Measured result of an install -------------------------------------------------------

export interface CheckReading {
  pci: number;
  channel: number | null;
  rsrpDbm: number;
  rsrqDb: number | null;
  sinrDb: number | null;
}

export interface PredictedGain {
  pci: number;
  channel: number | null;
  gainDb: number;
}

export interface MeasuredGain {
  pci: number;
  channel: number | null;
  samplesBefore: number;
  samplesAfter: number;
  beforeRsrpDbm: number | null;
  afterRsrpDbm: number | null;
  /** after − before, medians of each phase. */
  measuredGainDb: number | null;
  predictedGainDb: number | null;
  /** measured − predicted: positive means the install did better than predicted. */
  differenceDb: number | null;
  beforeSinrDb: number | null;
  afterSinrDb: number | null;
  sinrChangeDb: number | null;
}

export function median(values: readonly number[]): number | null {
  if (values.length === 0) return null;
  const s = [...values].sort((a, b) => a - b);
  const mid = Math.floor(s.length / 2);
  return s.length % 2 ? s[mid]! : (s[mid - 1]! + s[mid]!) / 2;
}

const round1 = (v: number | null) => (v === null ? null : Math.round(v * 10) / 10);
const diff = (a: number | null, b: number | null) => (a === null || b === null ? null : round1(a - b));

interface Group {
  pci: number;
  channel: number | null;
  readings: CheckReading[];
}

function groupByCell(readings: readonly CheckReading[]): Group[] {
  const groups = new Map<string, Group>();
  for (const r of readings) {
    const key = `${r.pci}|${r.channel ?? ''}`;
    const g = groups.get(key) ?? { pci: r.pci, channel: r.channel, readings: [] };
    g.readings.push(r);
    groups.set(key, g);
  }
  return [...groups.values()];
}

// Same PCI and channel; a side that did not note the channel matches the one group of that
// PCI on the other side (PCIs repeat across channels, so two candidates stay unmatched).
function findPartner(g: Group, others: readonly Group[]): Group | undefined {
  const exact = others.find((o) => o.pci === g.pci && o.channel === g.channel);
  if (exact) return exact;
  const loose = others.filter((o) => o.pci === g.pci && (o.channel === null || g.channel === null));
  return loose.length === 1 ? loose[0] : undefined;
}

/**
 * Measured gain per cell (PCI + channel): median RSRP after − median RSRP before, beside the
 * predicted gain where one was given. Cells seen in only one phase are listed with nulls.
 * Ordered with predicted cells first, then by RSRP after the install, strongest first.
 */
export function getMeasuredGains(before: readonly CheckReading[], after: readonly CheckReading[], predicted: readonly PredictedGain[] = []): MeasuredGain[] {
  const beforeGroups = groupByCell(before);
  const afterGroups = groupByCell(after);
  const used = new Set<Group>();
  const pairs: Array<{ b?: Group; a?: Group }> = [];
  for (const a of afterGroups) {
    const b = findPartner(
      a,
      beforeGroups.filter((x) => !used.has(x)),
    );
    if (b) used.add(b);
    pairs.push({ a, b });
  }
  for (const b of beforeGroups) if (!used.has(b)) pairs.push({ b });

  const rows = pairs.map(({ a, b }): MeasuredGain => {
    const pci = (a ?? b)!.pci;
    const channel = a?.channel ?? b?.channel ?? null;
    const beforeRsrp = b ? median(b.readings.map((r) => r.rsrpDbm)) : null;
    const afterRsrp = a ? median(a.readings.map((r) => r.rsrpDbm)) : null;
    const beforeSinr = b ? median(b.readings.flatMap((r) => (r.sinrDb === null ? [] : [r.sinrDb]))) : null;
    const afterSinr = a ? median(a.readings.flatMap((r) => (r.sinrDb === null ? [] : [r.sinrDb]))) : null;
    const pred = predicted.find((p) => p.pci === pci && (p.channel === null || channel === null || p.channel === channel));
    const measured = diff(afterRsrp, beforeRsrp);
    const predictedGain = pred ? round1(pred.gainDb) : null;
    return {
      pci,
      channel,
      samplesBefore: b?.readings.length ?? 0,
      samplesAfter: a?.readings.length ?? 0,
      beforeRsrpDbm: round1(beforeRsrp),
      afterRsrpDbm: round1(afterRsrp),
      measuredGainDb: measured,
      predictedGainDb: predictedGain,
      differenceDb: diff(measured, predictedGain),
      beforeSinrDb: round1(beforeSinr),
      afterSinrDb: round1(afterSinr),
      sinrChangeDb: diff(afterSinr, beforeSinr),
    };
  });
  return rows.sort((x, y) => {
    const px = x.predictedGainDb === null ? 1 : 0;
    const py = y.predictedGainDb === null ? 1 : 0;
    if (px !== py) return px - py;
    return (y.afterRsrpDbm ?? -Infinity) - (x.afterRsrpDbm ?? -Infinity) || x.pci - y.pci;
  });
}

export interface SpeedTest {
  downMbps: number;
  upMbps: number;
  latencyMs: number | null;
}

export interface SpeedSummary {
  tests: number;
  downMbps: number | null;
  upMbps: number | null;
  latencyMs: number | null;
}

export function summariseSpeedTests(tests: readonly SpeedTest[]): SpeedSummary {
  return {
    tests: tests.length,
    downMbps: round1(median(tests.map((t) => t.downMbps))),
    upMbps: round1(median(tests.map((t) => t.upMbps))),
    latencyMs: round1(median(tests.flatMap((t) => (t.latencyMs === null ? [] : [t.latencyMs])))),
  };
}
