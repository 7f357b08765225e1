// One plan on the customer's page: cell, kit and figures, install checks, and the steps it can take.
import { useState } from 'react';
import { plansApi } from '../../lib/client/plans-api';
import type { PlanDetailJson } from '../../lib/schemas/plans';
import { hasFigures } from '../../lib/schemas/plans';
import { PLAN_STATES, PLAN_STATE_LABELS, isKitLocked, type PlanState } from '../../lib/domain/plan-state';
import { MISSING, formatBearing, formatDate, formatDb, formatDbm, formatDistance, formatMbps, formatMetres, formatTilt } from '../../lib/domain/format';
import { useSubmit } from '../ui/use-api';
import InstallCheckForm from './InstallCheckForm';
import { InstallCheckResult } from './InstallCheckResult';
import { Facts } from './Facts';
import { PlanStateBadge, PlanSteps } from './PlanStateBadge';
import MarkInstalled from '../schedule/MarkInstalled';

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

/** The names of the plan's fields in the messages of a refused change. */
const FIELD_LABELS: Record<string, string> = {
  cell_id: 'Cell',
  antenna_id: 'Antenna',
  cable_id: 'Cable',
  cable_m: 'Cable length',
  mount_height_m: 'Mount height',
  scheduled_for: 'Install date',
  checks: 'Checks',
};

const rank = (s: PlanState) => PLAN_STATES.indexOf(s);

interface Props {
  plan: PlanDetailJson;
  canWrite: boolean;
  canRecord: boolean;
  onChanged: (p: PlanDetailJson) => void;
}

export function PlanCard({ plan, canWrite, canRecord, onChanged }: Props) {
  const [date, setDate] = useState(plan.scheduled_for ?? '');
  const saving = useSubmit();
  const f = hasFigures(plan.figures) ? plan.figures : null;

  async function change(body: Parameters<typeof plansApi.update>[1], failed: string) {
    const result = await saving.submit(() => plansApi.update(plan.id, body), { failed });
    if (result.ok) onChanged(result.data);
  }

  const reschedule = () => change({ scheduled_for: date || null, row_version: plan.row_version }, 'Could not move the visit');

  const move = (to: PlanState) =>
    change(
      to === 'scheduled' && rank(to) > rank(plan.state)
        ? { state: to, scheduled_for: date || null, row_version: plan.row_version }
        : { state: to, row_version: plan.row_version },
      'Could not change the plan',
    );

  const forward = plan.next_states.filter((s) => rank(s) > rank(plan.state));
  const back = plan.next_states.filter((s) => rank(s) < rank(plan.state));
  const problem = saving.error;

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

      {plan.checks.length > 0 && <InstallCheckResult plan={plan} />}

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
                  aria-invalid={!!saving.fields.scheduled_for}
                />
              </label>
            )}
            {plan.state === 'scheduled' && (
              <button type="button" className="btn-secondary py-1.5" disabled={saving.pending || !date || date === plan.scheduled_for} onClick={reschedule}>
                Move the visit
              </button>
            )}
            {forward.map((s) => (
              <button key={s} type="button" className="btn-primary py-1.5" disabled={saving.pending} onClick={() => move(s)}>
                {STEP_VERB[s]}
              </button>
            ))}
            {back.map((s) => (
              <button key={s} type="button" className="btn-secondary py-1.5" disabled={saving.pending} onClick={() => move(s)}>
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
                      {FIELD_LABELS[k] ?? k}: {msgs.join('; ')}
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
