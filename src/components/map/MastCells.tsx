import { useState } from 'react';
import { ApiError } from '../../lib/client/api';
import { cellsApi, mastsApi } from '../../lib/client/masts-api';
import type { CellJson } from '../../lib/schemas/masts';
import type { MastDetailJson } from '../../lib/schemas/mast-responses';
import { SortableTable, type Column } from '../ui/SortableTable';
import { FocusBlock } from '../ui/FocusBlock';
import { MISSING, formatDate, formatNumber } from '../../lib/domain/format';
import CellForm from './CellForm';
import { TECH_LABELS } from './MapFilters';
import type { OperatorMark } from './mast-icons';

interface Props {
  mast: MastDetailJson;
  operators: readonly OperatorMark[];
  canEdit: boolean;
  /** After a change: reload the mast and redraw the map. */
  onChanged: () => void;
}

type Mode = { kind: 'view' } | { kind: 'add' } | { kind: 'edit'; cell: CellJson } | { kind: 'remove'; cell: CellJson };

const fmt = (v: number | null | undefined, digits = 0, unit = '') => (v === null || v === undefined ? MISSING : `${formatNumber(v, digits)}${unit}`);
const fmtDate = formatDate;

const bandOrder = (b: string) => {
  const m = /^([A-Za-z]*)(\d+)/.exec(b);
  return m ? `${m[1].toLowerCase() === 'n' ? 'n' : 'b'}${m[2].padStart(4, '0')}` : b;
};

/** "LTE B20 cell on channel 6300 (PCI 101)": how a cell is named in buttons and messages. */
export const cellName = (c: CellJson) => `${c.tech.toUpperCase()} ${c.band} cell on channel ${c.channel}${c.pci === null ? '' : ` (PCI ${c.pci})`}`;

/** The mast's cells; those who may edit masts add, edit and remove them here. */
export default function MastCells({ mast, operators, canEdit, onChanged }: Props) {
  const [mode, setMode] = useState<Mode>({ kind: 'view' });
  const [refused, setRefused] = useState<{ cell: CellJson; message: string } | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  const start = (next: Mode) => {
    setRefused(null);
    setError(null);
    setMode(next);
  };

  async function remove(cell: CellJson) {
    setBusy(true);
    setError(null);
    try {
      await cellsApi.remove(cell.id);
      setMode({ kind: 'view' });
      onChanged();
    } catch (err) {
      setMode({ kind: 'view' });
      if (err instanceof ApiError && err.status === 409) setRefused({ cell, message: err.message });
      else setError(err instanceof ApiError ? err.message : 'Could not remove the cell');
    } finally {
      setBusy(false);
    }
  }

  async function decommission() {
    setBusy(true);
    setError(null);
    try {
      await mastsApi.update(mast.id, { row_version: mast.row_version, status: 'decommissioned' });
      setRefused(null);
      onChanged();
    } catch (err) {
      setError(err instanceof ApiError ? err.message : 'Could not mark the mast decommissioned');
    } finally {
      setBusy(false);
    }
  }

  const columns: Column<CellJson>[] = [
    {
      key: 'operator',
      label: 'Operator',
      sortValue: (c) => c.operator.name,
      render: (c) => (
        <span className="inline-flex items-center gap-1.5 whitespace-nowrap" title={c.operator.name}>
          <span aria-hidden="true" className="inline-block h-2.5 w-2.5 rounded-full" style={{ background: c.operator.colour }} />
          <span aria-hidden="true">{c.operator.name.split(/\s+/)[0]}</span>
          <span className="sr-only">{c.operator.name}</span>
        </span>
      ),
    },
    {
      key: 'band',
      label: 'Band',
      sortValue: (c) => `${bandOrder(c.band)}:${c.tech}`,
      render: (c) => (
        <span className="whitespace-nowrap">
          <abbr title={TECH_LABELS[c.tech]} className="no-underline">
            {c.tech.toUpperCase()}
          </abbr>{' '}
          {c.band}
        </span>
      ),
    },
    {
      key: 'channel',
      label: 'Channel',
      sortValue: (c) => c.dl_mhz ?? c.channel,
      render: (c) => (
        <span className="inline-flex flex-col items-end leading-tight">
          <span>{c.channel}</span>
          <span className="whitespace-nowrap text-ink-500">{fmt(c.dl_mhz, 1, ' MHz')}</span>
        </span>
      ),
      className: 'text-right',
    },
    { key: 'pci', label: 'PCI', sortValue: (c) => c.pci, render: (c) => fmt(c.pci), className: 'text-right' },
    { key: 'azimuth', label: 'Azimuth', sortValue: (c) => c.sector_azimuth_deg, render: (c) => fmt(c.sector_azimuth_deg, 0, '°'), className: 'text-right' },
    {
      key: 'seen',
      label: 'Last observed',
      sortValue: (c) => c.last_observed_at,
      render: (c) => <span className="whitespace-nowrap">{fmtDate(c.last_observed_at)}</span>,
    },
  ];
  // First, so that it is never scrolled out of sight in the side panel; cards on phones.
  if (canEdit)
    columns.unshift({
      key: 'edit',
      label: 'Edit',
      render: (c) => (
        <button type="button" className="btn-secondary px-2 py-1 text-xs" onClick={() => start({ kind: 'edit', cell: c })} aria-label={`Edit ${cellName(c)}`}>
          Edit
        </button>
      ),
    });

  return (
    <section aria-labelledby="mast-cells-heading" data-testid="mast-cells" className="space-y-2">
      <div className="flex items-center justify-between gap-2">
        <h3 id="mast-cells-heading" className="font-semibold text-ink-800">
          Cells ({mast.cells.length})
        </h3>
        {canEdit && mode.kind === 'view' && (
          <button type="button" className="btn-secondary px-2.5 py-1 text-xs" onClick={() => start({ kind: 'add' })}>
            Add cell
          </button>
        )}
      </div>

      {error && (
        <p role="alert" className="text-alarm-700">
          {error}
        </p>
      )}

      {refused && (
        <FocusBlock
          focusKey={refused}
          role="alert"
          className="space-y-2 rounded-md border border-alarm-100 bg-alarm-50 p-3 text-alarm-700"
          data-testid="cell-refused"
        >
          <p className="font-semibold">The {cellName(refused.cell)} was not removed.</p>
          <p>{refused.message}</p>
          <div className="flex flex-wrap gap-2">
            {mast.status !== 'decommissioned' && (
              <button type="button" className="btn-secondary py-1" onClick={decommission} disabled={busy}>
                Mark {mast.name} decommissioned
              </button>
            )}
            <button type="button" className="btn-secondary py-1" onClick={() => setRefused(null)}>
              Dismiss
            </button>
          </div>
        </FocusBlock>
      )}

      {mode.kind === 'remove' && (
        <FocusBlock
          focusKey={mode}
          role="group"
          aria-labelledby="cell-remove-question"
          className="space-y-2 rounded-md border border-ember-100 bg-ember-50 p-3 text-ink-900"
          data-testid="cell-remove-confirm"
        >
          <p id="cell-remove-question" className="font-semibold">
            Remove the {cellName(mode.cell)} from {mast.name}?
          </p>
          <p className="text-xs text-ink-700">Readings matched to it are kept and unlinked; the removal is recorded in the audit.</p>
          <div className="flex flex-wrap gap-2">
            <button type="button" className="btn-danger py-1" onClick={() => remove(mode.cell)} disabled={busy}>
              Remove cell
            </button>
            <button type="button" className="btn-secondary py-1" onClick={() => setMode({ kind: 'view' })} disabled={busy}>
              Keep it
            </button>
          </div>
        </FocusBlock>
      )}

      {(mode.kind === 'add' || mode.kind === 'edit') && (
        <CellForm
          key={mode.kind === 'edit' ? `${mode.cell.id}:${mode.cell.row_version}` : 'new'}
          mastId={mast.id}
          cell={mode.kind === 'edit' ? mode.cell : null}
          operators={operators}
          onCancel={() => setMode({ kind: 'view' })}
          onRemove={mode.kind === 'edit' ? () => start({ kind: 'remove', cell: mode.cell }) : undefined}
          onSaved={() => {
            setMode({ kind: 'view' });
            onChanged();
          }}
        />
      )}

      {/* Narrow padding, and headers that may wrap: all seven columns fit the side panel (28–32rem). */}
      <div className="[&_table]:text-xs [&_td]:px-1.5 [&_td]:py-1.5 [&_th]:px-1.5 [&_th]:py-1.5 [&_th_button]:text-left">
        <SortableTable
          rows={mast.cells}
          columns={columns}
          rowKey={(c) => c.id}
          initialSort={{ key: 'channel', dir: 'asc' }}
          empty="No cells recorded"
          caption={`Cells on ${mast.name}`}
        />
      </div>
    </section>
  );
}
