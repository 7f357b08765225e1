import { useState } from 'react';
import type { ShortlistItemJson } from '../../lib/schemas/shortlist';
import { SortableTable, type Column } from '../ui/SortableTable';
import { GradeBadge, TERRAIN_LABELS, describeConfidence } from './grades';
import { MISSING, formatDistance, formatNumber, formatSigned } from '../../lib/domain/format';

interface Props {
  items: ShortlistItemJson[];
  selectedCellId: string | null;
  onSelect: (cellId: string) => void;
}

/** Rows shown before "Show all": the best candidates matter, the tail is for completeness. */
const FIRST_ROWS = 12;

/** A right-aligned column of one figure: sorted by `value`, shown as `text` in even-width digits. */
function figures(
  key: string,
  label: string,
  value: (i: ShortlistItemJson) => number | null,
  text: (i: ShortlistItemJson) => string,
  className = '',
): Column<ShortlistItemJson> {
  return {
    key,
    label,
    sortValue: value,
    render: (i) => <span className={`${className} tabular-nums`.trim()}>{text(i)}</span>,
    className: 'text-right',
  };
}

export default function ShortlistTable({ items, selectedCellId, onSelect }: Props) {
  const [showAll, setShowAll] = useState(false);
  const selectedIndex = items.findIndex((i) => i.cell_id === selectedCellId);
  const visible = showAll ? items : items.slice(0, Math.max(FIRST_ROWS, selectedIndex + 1));
  const columns: Column<ShortlistItemJson>[] = [
    { key: 'rank', label: '#', sortValue: (i) => i.rank, render: (i) => i.rank, className: 'hidden sm:table-cell' },
    {
      key: 'mast',
      label: 'Mast / cell',
      sortValue: (i) => i.mast.name,
      render: (i) => (
        <button type="button" className="text-left" onClick={() => onSelect(i.cell_id)} aria-pressed={i.cell_id === selectedCellId}>
          <span className="block font-semibold underline decoration-ink-300 underline-offset-2">{i.mast.name}</span>
          <span className="text-xs text-ink-600">
            <span className="mr-1 inline-block h-2 w-2 rounded-full" style={{ background: i.operator.colour ?? '#476785' }} aria-hidden="true" />
            {i.operator.name} · {i.tech.toUpperCase()} {i.band} · ch {i.channel} · PCI {i.pci ?? MISSING}
          </span>
          {i.preferred && (
            <span className="ml-1 rounded bg-ink-100 px-1 text-xs font-semibold text-ink-800" data-testid="preferred">
              preferred
            </span>
          )}
        </button>
      ),
    },
    figures(
      'dist',
      'Distance',
      (i) => i.distance_m,
      (i) => formatDistance(i.distance_m),
      'whitespace-nowrap',
    ),
    figures(
      'bearing',
      'Aim °T / °M',
      (i) => i.bearing_true_deg,
      (i) => `${formatNumber(i.bearing_true_deg, 1)} / ${formatNumber(i.bearing_magnetic_deg, 1)}`,
    ),
    figures(
      'elev',
      'Tilt °',
      (i) => i.elevation_deg,
      (i) => formatNumber(i.elevation_deg, 1),
    ),
    { key: 'terrain', label: 'Terrain', sortValue: (i) => i.terrain.diffraction_loss_db, render: (i) => TERRAIN_LABELS[i.terrain.status] },
    {
      key: 'rsrp',
      label: 'RSRP dBm',
      sortValue: (i) => i.predicted_rsrp_dbm,
      render: (i) => (
        <span className="flex flex-wrap items-center justify-end gap-1">
          <span className="font-semibold tabular-nums" data-testid="rsrp">
            {formatNumber(i.predicted_rsrp_dbm, 0)}
          </span>
          <GradeBadge grade={i.grade} />
        </span>
      ),
      className: 'text-right',
    },
    {
      key: 'sinr',
      label: 'SINR dB · Mbit/s',
      sortValue: (i) => i.sinr_db,
      render: (i) => (
        <span
          className="tabular-nums"
          data-testid="sinr"
          title={
            i.interferers ? `${i.interferers} co-channel cell${i.interferers === 1 ? '' : 's'} of ${i.operator.name} counted` : 'no co-channel cell nearby'
          }
        >
          {formatNumber(i.sinr_db, 1)}
          <span className="text-ink-600"> · {formatNumber(i.expected_throughput_mbps, 0)}</span>
        </span>
      ),
      className: 'text-right',
    },
    figures(
      'gain',
      'Gain dB',
      (i) => i.expected_gain_db,
      (i) => formatSigned(i.expected_gain_db, 1),
    ),
    {
      key: 'cal',
      label: 'Confidence',
      sortValue: (i) => -(i.calibration?.uncertainty_db ?? 8),
      render: (i) => (
        <span title={describeConfidence(i.calibration)}>{i.calibration ? `${i.calibration.confidence} (${i.calibration.readings_used})` : 'model'}</span>
      ),
      className: 'hidden text-right sm:table-cell',
    },
  ];
  return (
    <>
      <SortableTable
        rows={visible}
        columns={columns}
        rowKey={(i) => i.cell_id}
        empty="No active LTE or NR cell within the search radius"
        caption="ShortlistJson"
        rowClassName={(i) => (i.cell_id === selectedCellId ? 'bg-ember-50' : undefined)}
      />
      {items.length > visible.length && (
        <button type="button" className="btn-secondary mt-3" onClick={() => setShowAll(true)}>
          Show all {items.length} candidates
        </button>
      )}
    </>
  );
}
