import { PLAN_STATES, PLAN_STATE_LABELS, type PlanState } from '../../lib/domain/plan-state';

// Our own palette: slate for paperwork, amber once a visit is booked, moss once installed.
const STYLE: Record<PlanState, string> = {
  enquiry: 'bg-ink-100 text-ink-700 ring-ink-300',
  planned: 'bg-ink-700 text-white ring-ink-700',
  scheduled: 'bg-ember-100 text-ember-700 ring-ember-500',
  installed: 'bg-moss-50 text-moss-700 ring-moss-500',
  verified: 'bg-moss-600 text-white ring-moss-600',
};

/** The plan's state as a labelled badge; the step number keeps it readable without colour. */
export function PlanStateBadge({ state }: { state: PlanState }) {
  return (
    <span
      className={`inline-flex items-center gap-1 whitespace-nowrap rounded-full px-2 py-0.5 text-xs font-semibold ring-1 ${STYLE[state]}`}
      data-testid="plan-state"
    >
      <span aria-hidden="true">{PLAN_STATES.indexOf(state) + 1}/5</span>
      {PLAN_STATE_LABELS[state]}
    </span>
  );
}

/** The five steps with the current one marked. */
export function PlanSteps({ state }: { state: PlanState }) {
  const at = PLAN_STATES.indexOf(state);
  return (
    <ol className="flex flex-wrap items-center gap-1 text-xs" aria-label="Plan progress">
      {PLAN_STATES.map((s, i) => (
        <li key={s} className="flex items-center gap-1" aria-current={i === at ? 'step' : undefined}>
          <span
            className={[
              'rounded px-1.5 py-0.5',
              i < at ? 'bg-moss-50 text-moss-700' : i === at ? 'bg-ink-700 font-semibold text-white' : 'bg-ink-50 text-ink-600',
            ].join(' ')}
          >
            {i < at ? '✓ ' : ''}
            {PLAN_STATE_LABELS[s]}
          </span>
          {i < PLAN_STATES.length - 1 && (
            <span aria-hidden="true" className="text-ink-300">
              ›
            </span>
          )}
        </li>
      ))}
    </ol>
  );
}
