import type { ReactNode } from 'react';
import { type OperatorMark } from './mast-icons';
import { MAST_STATUSES, MAST_STATUS_LABELS, type MastStatus } from '../../lib/schemas/mast-enums';
import { NO_MAST_FILTER, isFiltering, type MastFilterState } from './layers';
import ExportLinks from '../exports/ExportLinks';

export const TECH_LABELS: Record<string, string> = { gsm: '2G GSM', umts: '3G UMTS', lte: '4G LTE', nr: '5G NR' };
export const TECHS = ['gsm', 'umts', 'lte', 'nr'] as const;

interface Props {
  operators: readonly OperatorMark[];
  bands: readonly string[];
  value: MastFilterState;
  onChange: (next: MastFilterState) => void;
}

function toggle<T>(list: readonly T[], item: T): T[] {
  return list.includes(item) ? list.filter((x) => x !== item) : [...list, item];
}

function Chip({ checked, onChange, children, testId }: { checked: boolean; onChange: () => void; children: ReactNode; testId?: string }) {
  return (
    <label
      className={[
        'inline-flex cursor-pointer items-center gap-1.5 rounded-full border px-2.5 py-1 text-xs focus-within:ring-2 focus-within:ring-ember-500',
        checked ? 'border-ink-600 bg-ink-700 text-white' : 'border-ink-200 bg-white text-ink-800 hover:border-ink-400',
      ].join(' ')}
    >
      <input type="checkbox" className="sr-only" checked={checked} onChange={onChange} data-testid={testId} />
      {children}
    </label>
  );
}

function Group({ legend, children }: { legend: string; children: ReactNode }) {
  return (
    <fieldset>
      <legend className="mb-1 text-xs font-semibold text-ink-600">{legend}</legend>
      <div className="flex flex-wrap gap-1.5">{children}</div>
    </fieldset>
  );
}

/** Filters for the masts on the map; empty groups mean "any". */
export default function MapFilters({ operators, bands, value, onChange }: Props) {
  const set = (patch: Partial<MastFilterState>) => onChange({ ...value, ...patch });
  return (
    <form className="space-y-3" aria-label="Filter masts" onSubmit={(e) => e.preventDefault()} data-testid="map-filters">
      <Group legend="Operator">
        {operators.map((o) => (
          <Chip
            key={o.id}
            checked={value.operators.includes(o.id)}
            onChange={() => set({ operators: toggle(value.operators, o.id) })}
            testId={`filter-operator-${o.id}`}
          >
            <span aria-hidden="true" className="inline-block h-2.5 w-2.5 rounded-full ring-1 ring-white" style={{ background: o.colour }} />
            {o.name}
          </Chip>
        ))}
      </Group>
      <Group legend="Technology">
        {TECHS.map((t) => (
          <Chip key={t} checked={value.techs.includes(t)} onChange={() => set({ techs: toggle(value.techs, t) })} testId={`filter-tech-${t}`}>
            {TECH_LABELS[t]}
          </Chip>
        ))}
      </Group>
      <Group legend="Band">
        {bands.length === 0 && <span className="text-xs text-ink-500">No bands recorded yet</span>}
        {bands.map((b) => (
          <Chip key={b} checked={value.bands.includes(b)} onChange={() => set({ bands: toggle(value.bands, b) })} testId={`filter-band-${b}`}>
            {b}
          </Chip>
        ))}
      </Group>
      <Group legend="Status">
        {MAST_STATUSES.map((s: MastStatus) => (
          <Chip key={s} checked={value.statuses.includes(s)} onChange={() => set({ statuses: toggle(value.statuses, s) })} testId={`filter-status-${s}`}>
            {MAST_STATUS_LABELS[s]}
          </Chip>
        ))}
      </Group>
      <div className="flex items-center justify-between gap-2 pt-1">
        <p className="text-xs text-ink-500" aria-live="polite">
          {isFiltering(value) ? 'Showing matching masts only' : 'Showing all masts'}
        </p>
        <button type="button" className="btn-secondary px-2.5 py-1 text-xs" onClick={() => onChange(NO_MAST_FILTER)} disabled={!isFiltering(value)}>
          Clear
        </button>
      </div>
      <details className="border-t border-ink-100 pt-2" data-testid="map-export">
        <summary className="cursor-pointer text-xs font-semibold text-ink-700">Download with these filters</summary>
        <div className="mt-2">
          <ExportLinks
            layers={['masts', 'cells', 'readings', 'readings-hexagons']}
            filter={{
              operators: value.operators,
              techs: value.techs,
              bands: value.bands,
              statuses: value.statuses.length < MAST_STATUSES.length ? value.statuses : undefined,
            }}
            note="Hexagons follow the operator when exactly one is chosen, and then its band when exactly one is chosen."
          />
        </div>
      </details>
    </form>
  );
}
