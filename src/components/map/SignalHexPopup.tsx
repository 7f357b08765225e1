import { Popup } from 'react-map-gl/maplibre';
import { formatCount, formatNumber, formatQuantity } from '../../lib/domain/format';
import { SIGNAL_METRICS, SIGNAL_METRIC_LABELS, SIGNAL_METRIC_UNITS, SIGNAL_MIN_READINGS, getSignalClass } from '../../lib/domain/signal-map';
import { FocusBlock } from '../ui/FocusBlock';
import { SIGNAL_GRADE_LABELS, type HexFigures } from './signal-layers';

export interface SignalHexPick {
  lon: number;
  lat: number;
  /** Null: no hexagon there (no readings). */
  figures: HexFigures | null;
}

/** The figures of one measured-signal hexagon: how many readings, and each metric's median with its grade. */
export default function SignalHexPopup({ pick, onClose }: { pick: SignalHexPick; onClose: () => void }) {
  const f = pick.figures;
  return (
    <Popup longitude={pick.lon} latitude={pick.lat} anchor="bottom" offset={8} onClose={onClose} closeOnClick={false} maxWidth="18rem">
      {/* Keyboard and screen reader users land on the figures they asked for. */}
      <FocusBlock
        focusKey={pick}
        role="group"
        aria-label="Measured signal in this hexagon"
        className="space-y-1.5 pr-4 text-sm text-ink-900 focus:outline-none"
        data-testid="signal-hex-popup"
      >
        <p className="font-semibold">Measured signal here</p>
        {!f && <p data-testid="signal-hex-none">No readings here. Move the map so that a hexagon is at its centre.</p>}
        {f && (
          <>
            <p data-testid="signal-hex-readings">{formatQuantity(f.readings, 'reading')}</p>
            <table className="w-full text-xs">
              <caption className="sr-only">Median of each measure in this hexagon</caption>
              <thead className="text-left text-ink-600">
                <tr>
                  {['Median', 'Value', 'Grade', 'Readings'].map((h, n) => (
                    <th key={h} scope="col" className={`font-semibold ${n === 1 || n === 3 ? 'text-right' : ''} ${n < 3 ? 'pr-2' : ''}`}>
                      {h}
                    </th>
                  ))}
                </tr>
              </thead>
              <tbody>
                {SIGNAL_METRICS.map((m) => {
                  const median = f.medians[m];
                  return (
                    <tr key={m} data-testid={`signal-hex-${m}`}>
                      <th scope="row" className="pr-2 text-left font-semibold">
                        {SIGNAL_METRIC_LABELS[m]}
                      </th>
                      <td className="whitespace-nowrap pr-2 text-right tabular-nums">
                        {median === null ? '—' : `${formatNumber(median, 1)} ${SIGNAL_METRIC_UNITS[m]}`}
                      </td>
                      <td className="pr-2">{median === null ? '' : SIGNAL_GRADE_LABELS[getSignalClass(m, median)]}</td>
                      <td className="text-right tabular-nums">{formatCount(f.counts[m])}</td>
                    </tr>
                  );
                })}
              </tbody>
            </table>
            {SIGNAL_METRICS.some((m) => f.counts[m] > 0 && f.counts[m] < SIGNAL_MIN_READINGS) && (
              <p className="text-xs text-ink-600">Fewer than {SIGNAL_MIN_READINGS} readings say little about a place.</p>
            )}
          </>
        )}
      </FocusBlock>
    </Popup>
  );
}
