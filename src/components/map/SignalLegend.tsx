import { SIGNAL_METRIC_LABELS, SIGNAL_MIN_READINGS, getSignalClasses, type SignalMetric } from '../../lib/domain/signal-map';
import { SIGNAL_FAINT_OPACITY, SIGNAL_FILL_OPACITY, SIGNAL_GRADE_COLOURS, SIGNAL_GRADE_LABELS } from './signal-layers';

/** What the hexagons' colours mean for a metric: each grade with its range, and the faint ones. */
export default function SignalLegend({ metric }: { metric: SignalMetric }) {
  const classes = getSignalClasses(metric);
  const label = SIGNAL_METRIC_LABELS[metric];
  return (
    <div data-testid="signal-legend">
      <p className="mb-1 text-xs font-semibold text-ink-600">Median {label} per hexagon</p>
      <ul className="space-y-0.5 text-xs text-ink-800">
        {classes.map((c) => (
          <li key={c.grade} className="flex items-center gap-2" data-testid={`signal-class-${c.grade}`}>
            <span
              aria-hidden="true"
              className="inline-block h-3 w-5 shrink-0 rounded-sm border border-white"
              style={{ background: SIGNAL_GRADE_COLOURS[c.grade], opacity: SIGNAL_FILL_OPACITY + 0.2 }}
            />
            <span className="w-28 shrink-0 whitespace-nowrap tabular-nums">{c.range}</span>
            <span className="font-medium">{SIGNAL_GRADE_LABELS[c.grade]}</span>
          </li>
        ))}
        <li className="flex items-center gap-2 pt-1 text-ink-600">
          <span
            aria-hidden="true"
            className="inline-block h-3 w-5 shrink-0 rounded-sm border"
            style={{ background: SIGNAL_GRADE_COLOURS.good, opacity: SIGNAL_FAINT_OPACITY + 0.15, borderColor: SIGNAL_GRADE_COLOURS.good }}
          />
          <span>
            Faint: fewer than {SIGNAL_MIN_READINGS} {label} readings
          </span>
        </li>
      </ul>
      <p className="mt-1 text-xs text-ink-500">Hexagons get smaller as you zoom in. Grades are installers’ rules of thumb.</p>
    </div>
  );
}
