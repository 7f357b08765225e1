// A plan's install checks: the gain measured per cell against the predicted, and the speed tests.
import type { PlanDetailJson } from '../../lib/schemas/plans';
import { MISSING, formatDateTime, formatDb, formatDbm, formatMbps, formatNumber } from '../../lib/domain/format';
import { DataTable, FIGURES, type TableColumn } from '../ui/DataTable';

type Gain = PlanDetailJson['result']['gains'][number];
type Speed = PlanDetailJson['result']['speed_before'];

/** A measured gain more than this below the predicted one is shown in the alarm colour (dB). */
const SHORTFALL_DB = -3;

const speedText = (s: Speed) =>
  s.tests
    ? `${formatNumber(s.down_mbps, 1)} ↓ / ${formatNumber(s.up_mbps, 1)} ↑ Mbit/s${s.latency_ms !== null ? `, ${formatNumber(s.latency_ms, 0)} ms` : ''}`
    : MISSING;

function gainColumns(plannedPci: number | null): TableColumn<Gain>[] {
  return [
    {
      key: 'pci',
      label: 'PCI',
      render: (g) => (
        <span>
          {g.pci}
          {plannedPci === g.pci && <span className="ml-1 text-xs text-ink-500">(planned)</span>}
        </span>
      ),
    },
    { key: 'channel', label: 'Channel', render: (g) => g.channel ?? MISSING },
    { key: 'before', label: 'Before', className: FIGURES, render: (g) => formatDbm(g.before_rsrp_dbm, 1) },
    { key: 'after', label: 'After', className: FIGURES, render: (g) => formatDbm(g.after_rsrp_dbm, 1) },
    { key: 'measured', label: 'Measured gain', className: `${FIGURES} font-semibold`, render: (g) => formatDb(g.measured_gain_db, { signed: true }) },
    { key: 'predicted', label: 'Predicted gain', className: FIGURES, render: (g) => formatDb(g.predicted_gain_db, { signed: true }) },
    {
      key: 'difference',
      label: 'Difference',
      className: FIGURES,
      render: (g) => (
        <span className={g.difference_db !== null && g.difference_db < SHORTFALL_DB ? 'text-alarm-700' : undefined}>
          {formatDb(g.difference_db, { signed: true })}
        </span>
      ),
    },
  ];
}

export function InstallCheckResult({ plan }: { plan: PlanDetailJson }) {
  const r = plan.result;
  return (
    <section aria-label="Install checks" className="space-y-2">
      <h4 className="text-sm font-semibold text-ink-800">Install checks: measured against predicted</h4>
      <p className="text-xs text-ink-600">
        {plan.checks
          .map((c) => `${c.phase === 'before' ? 'Before' : 'After'} ${formatDateTime(c.taken_at)}${c.created_by_name ? ` (${c.created_by_name})` : ''}`)
          .join(' · ')}
      </p>
      <DataTable rows={r.gains} columns={gainColumns(plan.cell?.pci ?? null)} rowKey={(g) => `${g.pci}-${g.channel}`} caption="Measured gain per cell" />
      <p className="text-sm">
        <span className="text-ink-600">Speed before:</span> {speedText(r.speed_before)} · <span className="text-ink-600">after:</span>{' '}
        {speedText(r.speed_after)}
        {r.expected_throughput_mbps !== null && (
          <span data-testid="speed-vs-expected">
            {' '}
            · <span className="text-ink-600">expected up to</span> {formatMbps(r.expected_throughput_mbps)}
            {r.speed_after.down_mbps !== null &&
              ` (measured ${Math.round((100 * r.speed_after.down_mbps) / Math.max(0.1, r.expected_throughput_mbps))} % of it; the cell is shared, so less is normal at busy times)`}
          </span>
        )}
      </p>
    </section>
  );
}
