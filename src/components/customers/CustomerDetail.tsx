import { useCallback, useEffect, useState, type ReactNode } from 'react';
import { ApiError, type FieldErrors } from '../../lib/client/api';
import { customersApi } from '../../lib/client/customers-api';
import { plansApi } from '../../lib/client/plans-api';
import type { CustomerJson, HistoryEntryJson } from '../../lib/schemas/customers';
import type { PlanDetailJson } from '../../lib/schemas/plans';
import { hasFigures } from '../../lib/schemas/plans';
import { PLAN_STATES, PLAN_STATE_LABELS, isKitLocked, type PlanState } from '../../lib/domain/plan-state';
import InstallCheckForm from './InstallCheckForm';
import CustomerForm from './CustomerForm';
import EraseCustomer from './EraseCustomer';
import { PlanStateBadge, PlanSteps } from './PlanStateBadge';
import MarkInstalled from '../schedule/MarkInstalled';
import {
  MISSING,
  formatBearing,
  formatDate,
  formatDateTime,
  formatDb,
  formatDbm,
  formatDistance,
  formatLatLon,
  formatMbps,
  formatMetres,
  formatNumber,
  formatTilt,
} from '../../lib/domain/format';

interface Props {
  customerId: string;
  canWrite: boolean;
  /** Surveyors record install checks without editing plans. */
  canRecord: boolean;
}

function Facts({ items }: { items: Array<[string, ReactNode]> }) {
  return (
    <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
      {items.map(([k, v]) => (
        <div key={k} className="contents">
          <dt className="text-ink-600">{k}</dt>
          <dd className="min-w-0 break-words">{v}</dd>
        </div>
      ))}
    </dl>
  );
}

const TERRAIN_LABELS: Record<string, string> = {
  clear: 'Clear line of sight',
  fresnel: 'Fresnel zone infringed',
  obstructed: 'Obstructed',
};

const STEP_VERB: Record<PlanState, string> = {
  enquiry: 'Back to enquiry',
  planned: 'Mark planned',
  scheduled: 'Schedule the install',
  installed: 'Mark installed',
  verified: 'Mark verified',
};

function PlanCard({
  plan,
  canWrite,
  canRecord,
  onChanged,
}: {
  plan: PlanDetailJson;
  canWrite: boolean;
  canRecord: boolean;
  onChanged: (p: PlanDetailJson) => void;
}) {
  const [date, setDate] = useState(plan.scheduled_for ?? '');
  const [problem, setProblem] = useState<{ message: string; fields: FieldErrors } | null>(null);
  const [busy, setBusy] = useState(false);
  const f = hasFigures(plan.figures) ? plan.figures : null;
  const rank = (s: PlanState) => PLAN_STATES.indexOf(s);

  async function reschedule() {
    setBusy(true);
    setProblem(null);
    try {
      onChanged(await plansApi.update(plan.id, { scheduled_for: date || null, row_version: plan.row_version }));
    } catch (err) {
      setProblem(err instanceof ApiError ? { message: err.message, fields: err.fields } : { message: 'Could not move the visit', fields: {} });
    } finally {
      setBusy(false);
    }
  }

  async function move(to: PlanState) {
    setBusy(true);
    setProblem(null);
    try {
      const body =
        to === 'scheduled' && rank(to) > rank(plan.state)
          ? { state: to, scheduled_for: date || null, row_version: plan.row_version }
          : { state: to, row_version: plan.row_version };
      onChanged(await plansApi.update(plan.id, body));
    } catch (err) {
      setProblem(err instanceof ApiError ? { message: err.message, fields: err.fields } : { message: 'Could not change the plan', fields: {} });
    } finally {
      setBusy(false);
    }
  }

  const forward = plan.next_states.filter((s) => rank(s) > rank(plan.state));
  const back = plan.next_states.filter((s) => rank(s) < rank(plan.state));
  const fieldLabels: Record<string, string> = {
    cell_id: 'Cell',
    antenna_id: 'Antenna',
    cable_id: 'Cable',
    cable_m: 'Cable length',
    mount_height_m: 'Mount height',
    scheduled_for: 'Install date',
    checks: 'Checks',
  };

  return (
    <article id={`plan-${plan.id}`} className="card min-w-0 scroll-mt-4 space-y-3" aria-labelledby={`plan-${plan.id}-heading`} data-testid="plan-card">
      <header className="flex flex-wrap items-center gap-2">
        <h3 id={`plan-${plan.id}-heading`} className="font-semibold text-ink-800">
          Plan {plan.id}
        </h3>
        <PlanStateBadge state={plan.state} />
        <span className="text-xs text-ink-500">
          since {formatDate(plan.state_changed_at)}
          {plan.created_by_name && ` · created by ${plan.created_by_name}`}
        </span>
        <span className="ml-auto flex gap-2">
          {plan.cell && (
            <a className="btn-secondary py-1" href={`/plans/${plan.id}/sheet`}>
              Aim sheet
            </a>
          )}
        </span>
      </header>
      <PlanSteps state={plan.state} />
      <div className="grid gap-4 md:grid-cols-2">
        <Facts
          items={[
            [
              'Cell',
              plan.cell ? (
                `${plan.cell.operator_name} ${plan.cell.tech.toUpperCase()} ${plan.cell.band}, channel ${plan.cell.channel}${plan.cell.pci !== null ? `, PCI ${plan.cell.pci}` : ''}`
              ) : (
                <span className="text-ink-500">Not chosen yet</span>
              ),
            ],
            ['Mast', plan.cell ? plan.cell.mast_name : '—'],
            ['Antenna', plan.antenna_name ?? '—'],
            ['Cable', plan.cable_name ? `${plan.cable_m === null ? '?' : formatMetres(plan.cable_m)} of ${plan.cable_name}` : MISSING],
            ['Mount height', formatMetres(plan.mount_height_m)],
            ['Install date', formatDate(plan.scheduled_for)],
          ]}
        />
        {f ? (
          <Facts
            items={[
              ['Predicted RSRP', `${formatDbm(f.predicted_rsrp_dbm, 1)} (${f.grade})`],
              [
                'SINR',
                f.sinr_db == null
                  ? MISSING
                  : `${formatDb(f.sinr_db)}${f.expected_throughput_mbps != null ? ` · up to ${formatMbps(f.expected_throughput_mbps)}` : ''}`,
              ],
              ['Expected gain', formatDb(f.expected_gain_db, { signed: true })],
              ['Distance', formatDistance(f.distance_m)],
              ['Bearing', `${formatBearing(f.bearing_true_deg, 'true')} · ${formatBearing(f.bearing_magnetic_deg, 'magnetic')}`],
              ['Tilt', formatTilt(f.elevation_deg)],
              ['Terrain', TERRAIN_LABELS[f.terrain.status] ?? f.terrain.status],
            ]}
          />
        ) : (
          <p className="text-sm text-ink-500">No figures yet: choose a cell on the planner to record them.</p>
        )}
      </div>
      {plan.notes && <p className="whitespace-pre-line rounded bg-ink-50 p-2 text-sm">{plan.notes}</p>}

      {plan.checks.length > 0 && <CheckResult plan={plan} />}

      {canRecord && !canWrite && plan.state === 'scheduled' && (
        <MarkInstalled planId={plan.id} rowVersion={plan.row_version} customerId={plan.customer_id} onInstalled={onChanged} />
      )}

      {canRecord && plan.state !== 'enquiry' && (
        <InstallCheckForm
          planId={plan.id}
          defaultChannel={plan.cell?.channel ?? null}
          defaultPci={plan.cell?.pci ?? null}
          phases={isKitLocked(plan.state) ? ['after', 'before'] : ['before']}
          onSaved={async () => onChanged(await plansApi.get(plan.id))}
        />
      )}

      {canWrite && (
        <div className="space-y-2 border-t border-ink-100 pt-3">
          {(plan.state === 'planned' || plan.state === 'scheduled') && (
            <p className="rounded border border-ember-500 bg-ember-50 p-2 text-xs text-ember-700" role="note">
              Before anyone goes up a ladder: read the safety cautions on this page and on the aim sheet. Local codes, the owner’s consent and licensed
              professionals come first.
            </p>
          )}
          <div className="flex flex-wrap items-end gap-2">
            {(forward.includes('scheduled') || plan.state === 'scheduled') && (
              <label className="text-sm">
                <span className="field-label">Install date</span>
                <input
                  type="date"
                  className="field-input py-1"
                  value={date}
                  onChange={(e) => setDate(e.target.value)}
                  aria-invalid={!!problem?.fields.scheduled_for}
                />
              </label>
            )}
            {plan.state === 'scheduled' && (
              <button type="button" className="btn-secondary py-1.5" disabled={busy || !date || date === plan.scheduled_for} onClick={reschedule}>
                Move the visit
              </button>
            )}
            {forward.map((s) => (
              <button key={s} type="button" className="btn-primary py-1.5" disabled={busy} onClick={() => move(s)}>
                {STEP_VERB[s]}
              </button>
            ))}
            {back.map((s) => (
              <button key={s} type="button" className="btn-secondary py-1.5" disabled={busy} onClick={() => move(s)}>
                Back to {PLAN_STATE_LABELS[s].toLowerCase()}
              </button>
            ))}
          </div>
          {problem && (
            <div role="alert" className="rounded border border-alarm-500 bg-alarm-50 p-2 text-sm text-alarm-700">
              <p className="font-semibold">{problem.message}</p>
              {Object.keys(problem.fields).length > 0 && (
                <ul className="mt-1 list-disc pl-5">
                  {Object.entries(problem.fields).map(([k, msgs]) => (
                    <li key={k}>
                      {fieldLabels[k] ?? k}: {msgs.join('; ')}
                    </li>
                  ))}
                </ul>
              )}
            </div>
          )}
        </div>
      )}
    </article>
  );
}

function CheckResult({ plan }: { plan: PlanDetailJson }) {
  const r = plan.result;
  const speed = (s: typeof r.speed_before) =>
    s.tests
      ? `${formatNumber(s.down_mbps, 1)} ↓ / ${formatNumber(s.up_mbps, 1)} ↑ Mbit/s${s.latency_ms !== null ? `, ${formatNumber(s.latency_ms, 0)} ms` : ''}`
      : MISSING;
  return (
    <section aria-label="Install checks" className="space-y-2">
      <h4 className="text-sm font-semibold text-ink-800">Install checks: measured against predicted</h4>
      <p className="text-xs text-ink-600">
        {plan.checks
          .map((c) => `${c.phase === 'before' ? 'Before' : 'After'} ${formatDateTime(c.taken_at)}${c.created_by_name ? ` (${c.created_by_name})` : ''}`)
          .join(' · ')}
      </p>
      <div className="overflow-x-auto">
        <table className="data-table stack">
          <caption className="sr-only">Measured gain per cell</caption>
          <thead>
            <tr>
              <th scope="col">PCI</th>
              <th scope="col">Channel</th>
              <th scope="col" className="text-right">
                Before
              </th>
              <th scope="col" className="text-right">
                After
              </th>
              <th scope="col" className="text-right">
                Measured gain
              </th>
              <th scope="col" className="text-right">
                Predicted gain
              </th>
              <th scope="col" className="text-right">
                Difference
              </th>
            </tr>
          </thead>
          <tbody>
            {r.gains.map((g) => (
              <tr key={`${g.pci}-${g.channel}`}>
                <td data-label="PCI">
                  <span>
                    {g.pci}
                    {plan.cell?.pci === g.pci && <span className="ml-1 text-xs text-ink-500">(planned)</span>}
                  </span>
                </td>
                <td data-label="Channel">{g.channel ?? MISSING}</td>
                <td className="text-right tabular-nums" data-label="Before">
                  {formatDbm(g.before_rsrp_dbm, 1)}
                </td>
                <td className="text-right tabular-nums" data-label="After">
                  {formatDbm(g.after_rsrp_dbm, 1)}
                </td>
                <td className="text-right font-semibold tabular-nums" data-label="Measured gain">
                  {formatDb(g.measured_gain_db, { signed: true })}
                </td>
                <td className="text-right tabular-nums" data-label="Predicted gain">
                  {formatDb(g.predicted_gain_db, { signed: true })}
                </td>
                <td className={`text-right tabular-nums ${g.difference_db !== null && g.difference_db < -3 ? 'text-alarm-700' : ''}`} data-label="Difference">
                  {formatDb(g.difference_db, { signed: true })}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <p className="text-sm">
        <span className="text-ink-600">Speed before:</span> {speed(r.speed_before)} · <span className="text-ink-600">after:</span> {speed(r.speed_after)}
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

function describe(e: HistoryEntryJson): string {
  const what = e.entity === 'plan' ? `Plan ${e.entity_id}` : 'Customer';
  if (e.action === 'create') return `${what} created`;
  if (e.action === 'erase') return `${what}: personal data erased on request`;
  if (e.action === 'check') {
    const d = e.details ?? {};
    return `${what}: ${d.phase === 'after' ? 'after-install' : 'before'} check recorded (${d.readings ?? 0} readings, ${d.speed_tests ?? 0} speed tests)`;
  }
  const parts = e.changes.map((c) => {
    if (c.field === 'state') return `${c.before} → ${c.after}`;
    if (c.field === 'figures') return 'figures updated';
    const show = (v: unknown) => {
      const text = v === null || v === '' ? '—' : typeof v === 'object' ? '…' : String(v);
      return text.length > 48 ? `${text.slice(0, 47)}…` : text;
    };
    return `${c.field.replace(/_/g, ' ')}: ${show(c.before)} → ${show(c.after)}`;
  });
  return `${what}: ${parts.join('; ') || 'saved without changes'}`;
}

export default function CustomerDetail({ customerId, canWrite, canRecord }: Props) {
  const [customer, setCustomer] = useState<CustomerJson | null>(null);
  const [plans, setPlans] = useState<PlanDetailJson[] | null>(null);
  const [history, setHistory] = useState<HistoryEntryJson[]>([]);
  const [error, setError] = useState<string | null>(null);
  const [editing, setEditing] = useState(false);
  const [notice, setNotice] = useState<string | null>(null);

  const loadHistory = useCallback(
    () =>
      customersApi.history(customerId).then(
        (r) => setHistory(r.items),
        () => undefined,
      ),
    [customerId],
  );

  useEffect(() => {
    (async () => {
      try {
        const [c, list] = await Promise.all([customersApi.get(customerId), plansApi.list({ customer_id: customerId, limit: 50 })]);
        setCustomer(c);
        setPlans(await Promise.all(list.items.map((p) => plansApi.get(p.id))));
        await loadHistory();
      } catch (e) {
        setError(e instanceof ApiError ? e.message : 'Could not load the customer');
      }
    })();
  }, [customerId, loadHistory]);

  async function newEnquiry() {
    setNotice(null);
    try {
      const created = await plansApi.create({ customer_id: customerId });
      const detail = await plansApi.get(created.id);
      setPlans((l) => [detail, ...(l ?? [])]);
      setNotice(`Plan ${created.id} opened as an enquiry`);
      loadHistory();
    } catch (e) {
      setNotice(e instanceof ApiError ? e.message : 'Could not open a plan');
    }
  }

  if (error)
    return (
      <p role="alert" className="mt-6 text-alarm-700">
        {error}
      </p>
    );
  if (!customer || !plans) return <p className="mt-6 text-ink-500">Loading…</p>;

  return (
    <div className="mt-4 grid gap-6 lg:grid-cols-[1fr_22rem]">
      <div className="min-w-0 space-y-6">
        <section className="card min-w-0" aria-labelledby="customer-heading">
          <div className="mb-3 flex flex-wrap items-center gap-2">
            <h2 id="customer-heading">Details</h2>
            {canWrite && !editing && !customer.erased_at && (
              <button type="button" className="btn-secondary ml-auto py-1" onClick={() => setEditing(true)}>
                Edit
              </button>
            )}
          </div>
          {customer.erased_at && (
            <p role="note" className="mb-3 rounded bg-ink-50 p-2 text-sm text-ink-700">
              Personal data erased on the customer’s request on {formatDate(customer.erased_at)}. The position is kept only to about 11 km.
            </p>
          )}
          {editing ? (
            <CustomerForm
              customer={customer}
              submitLabel="Save changes"
              onCancel={() => setEditing(false)}
              onSave={async (body) => {
                const saved = await customersApi.update(customer.id, { ...body, row_version: customer.row_version });
                setCustomer(saved);
                setEditing(false);
                setNotice('Customer saved');
                loadHistory();
              }}
            />
          ) : (
            <Facts
              items={[
                ['Address', `${customer.address_label}${customer.postcode ? `, ${customer.postcode}` : ''}`],
                ['Position', formatLatLon(customer.lat, customer.lon)],
                [
                  'Phone',
                  customer.phone ? (
                    <a className="underline" href={`tel:${customer.phone.replace(/[^+\d]/g, '')}`}>
                      {customer.phone}
                    </a>
                  ) : (
                    '—'
                  ),
                ],
                [
                  'E-mail',
                  customer.email ? (
                    <a className="underline" href={`mailto:${customer.email}`}>
                      {customer.email}
                    </a>
                  ) : (
                    '—'
                  ),
                ],
                ['Today', [customer.current_operator_name, customer.current_antenna_name].filter(Boolean).join(' · ') || '—'],
                ['Notes', customer.notes ? <span className="whitespace-pre-line">{customer.notes}</span> : '—'],
              ]}
            />
          )}
          {canWrite && !editing && !customer.erased_at && (
            <div className="mt-3 flex border-t border-ink-100 pt-3">
              {/* The name is in the page heading too: erasure loads the page again to show the erased record. */}
              <EraseCustomer customerId={customer.id} customerName={customer.name} onErased={() => window.location.reload()} />
            </div>
          )}
        </section>

        <section aria-labelledby="plans-heading" className="space-y-3">
          <div className="flex flex-wrap items-center gap-2">
            <h2 id="plans-heading">Plans</h2>
            {canWrite && (
              <span className="ml-auto flex flex-wrap gap-2">
                <a className="btn-primary py-1.5" href={`/plan?customer=${customer.id}`}>
                  Plan on the map
                </a>
                <button type="button" className="btn-secondary py-1.5" onClick={newEnquiry}>
                  New enquiry
                </button>
              </span>
            )}
          </div>
          <p aria-live="polite" className="text-sm text-ink-600" data-testid="customer-notice">
            {notice}
          </p>
          {plans.length === 0 ? (
            <p className="card text-ink-500">No plans yet.</p>
          ) : (
            plans.map((p) => (
              <PlanCard
                key={p.id}
                plan={p}
                canWrite={canWrite}
                canRecord={canRecord}
                onChanged={(next) => {
                  setPlans((l) => (l ?? []).map((x) => (x.id === next.id ? next : x)));
                  setNotice(`Plan ${next.id} is now ${PLAN_STATE_LABELS[next.state].toLowerCase()}`);
                  loadHistory();
                }}
              />
            ))
          )}
        </section>
      </div>

      <section className="card min-w-0 self-start" aria-labelledby="history-heading">
        <h2 id="history-heading">History</h2>
        {history.length === 0 ? (
          <p className="mt-2 text-sm text-ink-500">Nothing recorded yet.</p>
        ) : (
          <ol className="mt-2 space-y-2 text-sm" data-testid="customer-history">
            {history.map((e) => (
              <li key={e.id} className="border-l-2 border-ink-200 pl-3">
                <p>{describe(e)}</p>
                <p className="text-xs text-ink-500">
                  <time dateTime={e.at}>{formatDateTime(e.at)}</time>
                  {e.user_name && ` · ${e.user_name}`}
                </p>
              </li>
            ))}
          </ol>
        )}
      </section>
    </div>
  );
}
