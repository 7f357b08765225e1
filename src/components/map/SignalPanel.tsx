import { useId, useState } from 'react';
import { SIGNAL_METRICS, SIGNAL_METRIC_LABELS } from '../../lib/domain/signal-map';
import type { OperatorMark } from './mast-icons';
import type { SignalState } from './signal-layers';
import SignalLegend from './SignalLegend';

interface Props {
  operators: readonly OperatorMark[];
  /** Bands to offer (as stored on cells: B20, n78 …). */
  bands: readonly string[];
  value: SignalState;
  onChange: (next: SignalState) => void;
  /** Start with the choices and legend folded away (phones). */
  compact?: boolean;
  /** Shows the figures of the hexagon at the map's centre (the keyboard's way to them). */
  onShowCentre?: () => void;
}

/**
 * The measured signal layer's switch, its choice of metric, operator and band, and its legend.
 * Everything is a native control, so it works from the keyboard.
 */
export default function SignalPanel({ operators, bands, value, onChange, compact = false, onShowCentre }: Props) {
  const id = useId();
  const [folded, setFolded] = useState(compact);
  const set = (patch: Partial<SignalState>) => onChange({ ...value, ...patch });
  return (
    <div className="pointer-events-auto flex flex-col items-start gap-2">
      <div className="flex gap-2">
        <button
          type="button"
          role="switch"
          aria-checked={value.on}
          className={`btn px-3 shadow-md ${value.on ? 'bg-ink-700 text-white hover:bg-ink-800' : 'border border-ink-300 bg-white text-ink-800 hover:bg-ink-100'}`}
          onClick={() => {
            set({ on: !value.on });
            if (!value.on) setFolded(compact);
          }}
          data-testid="signal-toggle"
        >
          <span aria-hidden="true" className="text-base leading-none">
            ⬡
          </span>
          Measured signal
        </button>
        {value.on && (
          <button
            type="button"
            className="btn border border-ink-300 bg-white px-3 text-ink-800 shadow-md hover:bg-ink-100"
            aria-expanded={!folded}
            aria-controls={`${id}-card`}
            onClick={() => setFolded(!folded)}
            data-testid="signal-legend-toggle"
          >
            {folded ? 'Legend' : 'Hide legend'}
          </button>
        )}
      </div>
      {value.on && (
        <section
          id={`${id}-card`}
          hidden={folded}
          aria-label="Measured signal"
          className="max-h-[50vh] w-80 max-w-full space-y-2 overflow-y-auto rounded-lg border border-ink-200 bg-white/95 p-3 shadow-md"
          data-testid="signal-panel"
        >
          <fieldset>
            <legend className="mb-1 text-xs font-semibold text-ink-600">Show</legend>
            <div className="inline-flex overflow-hidden rounded-md border border-ink-300">
              {SIGNAL_METRICS.map((m) => (
                <label
                  key={m}
                  className={`cursor-pointer px-3 py-1 text-xs font-semibold focus-within:ring-2 focus-within:ring-inset focus-within:ring-ember-500 ${value.metric === m ? 'bg-ink-700 text-white' : 'bg-white text-ink-800 hover:bg-ink-100'}`}
                >
                  <input type="radio" className="sr-only" name={`${id}-metric`} value={m} checked={value.metric === m} onChange={() => set({ metric: m })} />
                  {SIGNAL_METRIC_LABELS[m]}
                </label>
              ))}
            </div>
          </fieldset>
          <div className="grid grid-cols-2 gap-2 text-xs">
            <label className="flex flex-col gap-0.5">
              <span className="font-semibold text-ink-600">Operator</span>
              <select
                className="rounded border border-ink-300 bg-white px-1.5 py-1"
                value={value.operatorId}
                onChange={(e) => set({ operatorId: e.target.value, band: e.target.value ? value.band : '' })}
                data-testid="signal-operator"
              >
                <option value="">All operators</option>
                {operators.map((o) => (
                  <option key={o.id} value={o.id}>
                    {o.name}
                  </option>
                ))}
              </select>
            </label>
            <label className="flex flex-col gap-0.5">
              <span className="font-semibold text-ink-600">Band</span>
              <select
                className="rounded border border-ink-300 bg-white px-1.5 py-1"
                value={value.band}
                disabled={!value.operatorId}
                title={value.operatorId ? undefined : 'Choose an operator first: bands are per operator'}
                onChange={(e) => set({ band: e.target.value })}
                data-testid="signal-band"
              >
                <option value="">All bands</option>
                {[...new Set([...bands, ...(value.band ? [value.band] : [])])].map((b) => (
                  <option key={b} value={b}>
                    {b}
                  </option>
                ))}
              </select>
            </label>
          </div>
          <SignalLegend metric={value.metric} />
          {onShowCentre && (
            <button type="button" className="btn-secondary w-full justify-center py-1 text-xs" onClick={onShowCentre} data-testid="signal-centre">
              Figures at the map centre
            </button>
          )}
        </section>
      )}
    </div>
  );
}
