import { useCallback, useEffect, useMemo, useRef, useState } from 'react';
import { mastsApi } from '../../lib/client/masts-api';
import type { MastDetailJson, ReadingJson } from '../../lib/schemas/mast-responses';
import { useQuery } from '../ui/use-api';
import { STRUCTURE_TYPE_LABELS, type StructureType } from '../../lib/schemas/mast-enums';
import { SortableTable, type Column } from '../ui/SortableTable';
import { mastIconDataUrl, type OperatorMark } from './mast-icons';
import { MAST_STATUS_LABELS } from '../../lib/schemas/mast-enums';
import MastCells from './MastCells';
import MastEditForm from './MastEditForm';
import MastSurveys from './MastSurveys';
import { MISSING, formatDateTime, formatLatLon, formatNumber } from '../../lib/domain/format';
import PanelFrame from './PanelFrame';

interface Props {
  mastId: string;
  operators: readonly OperatorMark[];
  canEdit: boolean;
  onClose: () => void;
  /** Called after the mast was edited, so the map can redraw it. */
  onChanged: () => void;
}

const STATUS_BADGE: Record<MastDetailJson['status'], string> = {
  active: 'bg-moss-50 text-moss-700',
  planned: 'bg-ember-50 text-ember-700',
  decommissioned: 'bg-ink-100 text-ink-600',
};

const fmt = (v: number | null | undefined, digits = 0, unit = '') => (v === null || v === undefined ? MISSING : `${formatNumber(v, digits)}${unit}`);
const fmtTime = formatDateTime;

function CopyPosition({ lat, lon }: { lat: number; lon: number }) {
  const [copied, setCopied] = useState<string | null>(null);
  const text = formatLatLon(lat, lon, 6);
  async function copy() {
    try {
      await navigator.clipboard.writeText(text);
      setCopied('Copied');
    } catch {
      setCopied('Select and copy the text');
    }
    setTimeout(() => setCopied(null), 2000);
  }
  return (
    <div className="flex flex-wrap items-center gap-2">
      <code className="select-all rounded bg-ink-50 px-2 py-1 font-mono text-sm text-ink-900" data-testid="mast-position">
        {text}
      </code>
      <button type="button" className="btn-secondary px-2.5 py-1 text-xs" onClick={copy} aria-label={`Copy position ${text}`}>
        Copy
      </button>
      <span aria-live="polite" className="text-xs text-moss-700">
        {copied}
      </span>
    </div>
  );
}

/** Details of one mast: structure, position, operators, cells and recent readings. */
export default function MastPanel({ mastId, operators, canEdit, onClose, onChanged }: Props) {
  const query = useQuery<MastDetailJson>(mastId, () => mastsApi.get(mastId), { failed: 'Could not load the mast', keepOnError: false });
  // Another mast's details stay out of sight while this one loads.
  const mast = query.data?.id === mastId ? query.data : null;
  const error = query.error?.message ?? null;
  const [editing, setEditing] = useState(false);
  const headingRef = useRef<HTMLHeadingElement>(null);

  useEffect(() => setEditing(false), [mastId]);

  useEffect(() => {
    if (mast) headingRef.current?.focus();
  }, [mast]);

  useEffect(() => {
    const onKey = (e: KeyboardEvent) => e.key === 'Escape' && !(e.target instanceof HTMLElement && e.target.closest('form')) && onClose();
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  }, [onClose]);

  const cellsByOperator = useMemo(() => {
    const counts = new Map<string, number>();
    for (const c of mast?.cells ?? []) counts.set(c.operator.id, (counts.get(c.operator.id) ?? 0) + 1);
    return counts;
  }, [mast]);

  const { refetch } = query;
  const reload = useCallback(() => {
    setEditing(false);
    refetch();
    onChanged();
  }, [onChanged, refetch]);

  const icon = useMemo(
    () =>
      mast
        ? mastIconDataUrl(
            mast.status,
            mast.operators.map((o) => o.id),
            operators,
          )
        : null,
    [mast, operators],
  );

  const readingColumns: Column<ReadingJson>[] = [
    { key: 'time', label: 'When', sortValue: (r) => r.taken_at, render: (r) => <span className="whitespace-nowrap">{fmtTime(r.taken_at)}</span> },
    { key: 'tech', label: 'Tech', sortValue: (r) => r.tech, render: (r) => r.tech.toUpperCase() },
    { key: 'pci', label: 'PCI', sortValue: (r) => r.pci, render: (r) => fmt(r.pci), className: 'text-right' },
    { key: 'rsrp', label: 'RSRP dBm', sortValue: (r) => r.rsrp_dbm, render: (r) => fmt(r.rsrp_dbm), className: 'text-right' },
    { key: 'rsrq', label: 'RSRQ dB', sortValue: (r) => r.rsrq_db, render: (r) => fmt(r.rsrq_db, 1), className: 'text-right' },
    { key: 'sinr', label: 'SINR dB', sortValue: (r) => r.sinr_db, render: (r) => fmt(r.sinr_db, 1), className: 'text-right' },
  ];

  return (
    <PanelFrame
      labelledBy="mast-panel-heading"
      testId="mast-panel"
      closeLabel="Close mast details"
      onClose={onClose}
      header={
        <>
          {icon && <img src={icon} alt="" width={34} height={34} className="mt-0.5 shrink-0" />}
          <div className="min-w-0 flex-1">
            <h2
              id="mast-panel-heading"
              ref={headingRef}
              tabIndex={-1}
              className="truncate text-lg focus:outline-none focus-visible:ring-0 focus-visible:ring-offset-0"
            >
              {mast?.name ?? (error ? 'Mast' : 'Loading mast…')}
            </h2>
            {mast && (
              <p className="mt-0.5 flex flex-wrap items-center gap-2 text-xs text-ink-600">
                <span className={`rounded px-1.5 py-0.5 font-semibold ${STATUS_BADGE[mast.status]}`}>{MAST_STATUS_LABELS[mast.status]}</span>
                {mast.reference && <span>Ref. {mast.reference}</span>}
              </p>
            )}
          </div>
        </>
      }
    >
      {error && (
        <p role="alert" className="text-alarm-700">
          {error}
        </p>
      )}
      {!mast && !error && <p className="text-ink-500">Loading…</p>}
      {mast && editing && <MastEditForm key={mast.row_version} mast={mast} onCancel={() => setEditing(false)} onSaved={reload} />}
      {mast && !editing && (
        <>
          <dl className="grid grid-cols-[6.5rem_1fr] gap-x-3 gap-y-1.5">
            <dt className="text-ink-500">Structure</dt>
            <dd>
              {STRUCTURE_TYPE_LABELS[mast.structure_type as StructureType] ?? mast.structure_type}
              {mast.structure_height_m !== null && `, ${fmt(mast.structure_height_m, 0, ' m')} high`}
            </dd>
            <dt className="text-ink-500">Ground</dt>
            <dd>{fmt(mast.ground_elevation_m, 0, ' m')} above sea level</dd>
            <dt className="self-center text-ink-500">Position</dt>
            <dd>
              <CopyPosition lat={mast.lat} lon={mast.lon} />
            </dd>
            {mast.access_notes && (
              <>
                <dt className="text-ink-500">Access</dt>
                <dd className="whitespace-pre-line">{mast.access_notes}</dd>
              </>
            )}
          </dl>

          <section aria-labelledby="mast-operators-heading">
            <h3 id="mast-operators-heading" className="mb-1.5 font-semibold text-ink-800">
              Operators
            </h3>
            {mast.operators.length === 0 ? (
              <p className="text-ink-500">No operator recorded on this mast.</p>
            ) : (
              <ul className="flex flex-wrap gap-1.5">
                {mast.operators.map((o) => (
                  <li key={o.id} className="inline-flex items-center gap-1.5 rounded-full border border-ink-200 px-2.5 py-0.5">
                    <span aria-hidden="true" className="inline-block h-2.5 w-2.5 rounded-full" style={{ background: o.colour }} />
                    {o.name}
                    <span className="text-xs text-ink-500">
                      {cellsByOperator.get(o.id) ?? 0} {cellsByOperator.get(o.id) === 1 ? 'cell' : 'cells'}
                    </span>
                  </li>
                ))}
              </ul>
            )}
          </section>

          <MastCells mast={mast} operators={operators} canEdit={canEdit} onChanged={reload} />

          <section aria-labelledby="mast-readings-heading" className="[&_table]:text-xs [&_td]:px-2 [&_td]:py-1.5 [&_th]:px-2 [&_th]:py-1.5">
            <h3 id="mast-readings-heading" className="mb-1.5 font-semibold text-ink-800">
              Recent readings
            </h3>
            {mast.recent_readings.length === 0 ? (
              <p className="text-ink-500">No readings matched to this mast yet.</p>
            ) : (
              <SortableTable
                rows={mast.recent_readings}
                columns={readingColumns}
                rowKey={(r) => r.id}
                initialSort={{ key: 'time', dir: 'desc' }}
                caption={`Recent readings for ${mast.name}`}
              />
            )}
          </section>

          <MastSurveys mastId={mast.id} />

          {canEdit && (
            <div className="flex flex-wrap gap-2 border-t border-ink-100 pt-3">
              <button type="button" className="btn-secondary py-1.5" onClick={() => setEditing(true)}>
                Edit mast
              </button>
            </div>
          )}
        </>
      )}
    </PanelFrame>
  );
}
