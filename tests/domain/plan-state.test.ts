import { describe, expect, it } from 'vitest';
import {
  PLAN_STATES,
  canRecordChecks,
  canViewPlans,
  canWritePlans,
  checkTransition,
  getAllowedTransitions,
  getCheckPhaseProblem,
  getMeasuredGains,
  getMissingFacts,
  isKitLocked,
  median,
  summariseSpeedTests,
  type CheckReading,
  type PlanFacts,
  type PlanState,
} from '../../src/lib/domain/plan-state';

// The product's own workflow rules (planning and install checks); no outside source.
const COMPLETE: PlanFacts = {
  cellId: '7',
  antennaId: '1',
  cableId: '2',
  cableM: 10,
  mountHeightM: 6,
  scheduledFor: '2027-03-01',
  afterCheckCount: 1,
};
const EMPTY: PlanFacts = { cellId: null, antennaId: null, cableId: null, cableM: null, mountHeightM: null, scheduledFor: null, afterCheckCount: 0 };

describe('plan state transitions', () => {
  it.each<[PlanState, PlanState[]]>([
    ['enquiry', ['planned']],
    ['planned', ['scheduled', 'enquiry']],
    ['scheduled', ['installed', 'planned']],
    ['installed', ['verified', 'scheduled']],
    ['verified', ['installed']],
  ])('from %s allows %j', (from, to) => {
    expect(getAllowedTransitions(from)).toEqual(to);
  });

  it.each<[PlanState, PlanState]>([
    ['enquiry', 'scheduled'],
    ['enquiry', 'verified'],
    ['planned', 'installed'],
    ['scheduled', 'verified'],
    ['scheduled', 'enquiry'],
    ['verified', 'enquiry'],
    ['installed', 'planned'],
  ])('forbids skipping from %s to %s, naming the way forward', (from, to) => {
    const r = checkTransition(from, to, COMPLETE);
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.reason).toBe('forbidden');
    expect(r.message).toContain(`from ${from} to ${to}`);
  });

  it('treats staying in the same state as no transition', () => {
    for (const s of PLAN_STATES) expect(checkTransition(s, s, EMPTY)).toEqual({ ok: true });
  });

  it('needs a cell and the whole kit to become planned', () => {
    const r = checkTransition('enquiry', 'planned', EMPTY);
    expect(r).toMatchObject({ ok: false, reason: 'incomplete' });
    if (r.ok || r.reason !== 'incomplete') return;
    expect(Object.keys(r.fields).sort()).toEqual(['antenna_id', 'cable_id', 'cable_m', 'cell_id', 'mount_height_m']);
    expect(checkTransition('enquiry', 'planned', { ...EMPTY, ...COMPLETE, scheduledFor: null, afterCheckCount: 0 })).toEqual({ ok: true });
  });

  it('needs an install date to become scheduled', () => {
    const r = checkTransition('planned', 'scheduled', { ...COMPLETE, scheduledFor: null });
    expect(r).toMatchObject({ ok: false, reason: 'incomplete', fields: { scheduled_for: ['Set the install date'] } });
  });

  it('needs an after-install check to become verified', () => {
    const r = checkTransition('installed', 'verified', { ...COMPLETE, afterCheckCount: 0 });
    expect(r).toMatchObject({ ok: false, reason: 'incomplete', fields: { checks: ['Record an after-install check first'] } });
    expect(checkTransition('installed', 'verified', COMPLETE)).toEqual({ ok: true });
  });

  it('lets a plan step back without asking for more facts', () => {
    expect(checkTransition('planned', 'enquiry', EMPTY)).toEqual({ ok: true });
    expect(checkTransition('verified', 'installed', EMPTY)).toEqual({ ok: true });
  });

  it('lists what each state must hold', () => {
    expect(getMissingFacts('enquiry', EMPTY)).toEqual({});
    expect(Object.keys(getMissingFacts('verified', EMPTY))).toHaveLength(7);
  });

  it.each<[PlanState, boolean]>([
    ['enquiry', false],
    ['planned', false],
    ['scheduled', false],
    ['installed', true],
    ['verified', true],
  ])('kit locked in %s: %s', (s, locked) => {
    expect(isKitLocked(s)).toBe(locked);
  });
});

describe('install check phases', () => {
  it.each<[PlanState, boolean]>([
    ['enquiry', false],
    ['scheduled', false],
    ['installed', true],
    ['verified', true],
  ])('after-install check in %s allowed: %s', (s, ok) => {
    expect(getCheckPhaseProblem(s, 'after') === null).toBe(ok);
  });

  it('takes before checks in any state', () => {
    for (const s of PLAN_STATES) expect(getCheckPhaseProblem(s, 'before')).toBeNull();
  });
});

describe('who may see and change plans', () => {
  it.each([
    ['admin', true, true, true],
    ['planner', true, true, true],
    ['surveyor', true, false, true],
    ['reviewer', false, false, false],
    ['contributor', false, false, false],
  ] as const)('%s: view %s, write %s, record checks %s', (role, view, write, checks) => {
    expect(canViewPlans(role)).toBe(view);
    expect(canWritePlans(role)).toBe(write);
    expect(canRecordChecks(role)).toBe(checks);
  });

  it('denies a missing role', () => {
    expect(canViewPlans(null)).toBe(false);
  });
});

const r = (pci: number, rsrpDbm: number, channel: number | null = 6300, sinrDb: number | null = null): CheckReading => ({
  pci,
  channel,
  rsrpDbm,
  rsrqDb: null,
  sinrDb,
});

describe('measured gain per cell', () => {
  it('takes the median of each phase and compares it with the prediction', () => {
    const before = [r(101, -112), r(101, -110), r(101, -111, 6300, 1)];
    const after = [r(101, -99.5, 6300, 9), r(101, -101), r(101, -100)];
    const [row] = getMeasuredGains(before, after, [{ pci: 101, channel: 6300, gainDb: 10 }]);
    expect(row).toEqual({
      pci: 101,
      channel: 6300,
      samplesBefore: 3,
      samplesAfter: 3,
      beforeRsrpDbm: -111,
      afterRsrpDbm: -100,
      measuredGainDb: 11,
      predictedGainDb: 10,
      differenceDb: 1,
      beforeSinrDb: 1,
      afterSinrDb: 9,
      sinrChangeDb: 8,
    });
  });

  it('keeps the same PCI on two channels apart', () => {
    const rows = getMeasuredGains([r(5, -110, 6300), r(5, -100, 1300)], [r(5, -95, 6300), r(5, -98, 1300)]);
    expect(rows.map((x) => [x.channel, x.measuredGainDb])).toEqual([
      [6300, 15],
      [1300, 2],
    ]);
  });

  it('matches a reading without a channel to the one cell of that PCI', () => {
    const [row] = getMeasuredGains([r(7, -108, null)], [r(7, -97, 1300)]);
    expect(row).toMatchObject({ channel: 1300, measuredGainDb: 11 });
  });

  it('lists cells seen in one phase only, with no gain', () => {
    const rows = getMeasuredGains([r(1, -115)], [r(2, -90)]);
    expect(rows).toHaveLength(2);
    expect(rows.every((x) => x.measuredGainDb === null)).toBe(true);
  });

  it('orders predicted cells first, then the strongest after the install', () => {
    const rows = getMeasuredGains([], [r(1, -90), r(2, -80), r(3, -100)], [{ pci: 3, channel: null, gainDb: 6 }]);
    expect(rows.map((x) => x.pci)).toEqual([3, 2, 1]);
    expect(rows[0]).toMatchObject({ predictedGainDb: 6, measuredGainDb: null, differenceDb: null });
  });

  it('summarises speed tests with medians', () => {
    expect(
      summariseSpeedTests([
        { downMbps: 10, upMbps: 2, latencyMs: 40 },
        { downMbps: 30, upMbps: 4, latencyMs: null },
        { downMbps: 20, upMbps: 3, latencyMs: 60 },
      ]),
    ).toEqual({ tests: 3, downMbps: 20, upMbps: 3, latencyMs: 50 });
    expect(summariseSpeedTests([])).toEqual({ tests: 0, downMbps: null, upMbps: null, latencyMs: null });
  });

  it.each([
    [[], null],
    [[3], 3],
    [[4, 1, 3], 3],
    [[4, 1, 3, 2], 2.5],
  ])('median of %j is %s', (values, expected) => {
    expect(median(values)).toBe(expected);
  });
});
