import { useState } from 'react';
import { formatMhz } from '../../lib/domain/format';
import { toolsApi } from '../../lib/client/tools-api';
import type { ChannelJson, FrequencyJson } from '../../lib/schemas/tools';
import { useDebounced } from './useDebounced';
import { useQuery } from '../ui/use-api';
import { ResultRow } from './ResultRow';
import { Field, fieldAria } from '../ui/field';

const TECHS = [
  { value: 'lte', label: 'LTE (EARFCN)' },
  { value: 'nr', label: '5G NR (NR-ARFCN)' },
  { value: 'umts', label: 'UMTS (UARFCN)' },
  { value: 'gsm', label: 'GSM (ARFCN)' },
] as const;
type Tech = (typeof TECHS)[number]['value'];

type Mode = 'channel' | 'frequency';

export default function ChannelCalculator() {
  const [tech, setTech] = useState<Tech>('lte');
  const [mode, setMode] = useState<Mode>('channel');
  const [value, setValue] = useState('6300');
  const settled = useDebounced(`${tech}|${mode}|${value.trim()}`);
  const [sTech, sMode, sValue] = settled.split('|') as [Tech, Mode, string];
  const result = useQuery(
    sValue ? settled : null,
    () => toolsApi.channel(sMode === 'channel' ? { tech: sTech, channel: sValue } : { tech: sTech, freq_mhz: sValue }),
    { failed: 'Could not calculate', keepOnError: false },
  );
  const fieldError = result.fields.channel?.[0] ?? result.fields.freq_mhz?.[0] ?? result.fields.tech?.[0] ?? result.error?.message;
  const valueErrors = fieldError ? [fieldError] : undefined;
  // The number alone: the unit is printed beside it.
  const fmt = (mhz: number | null) => formatMhz(mhz, { unit: false });

  return (
    <section className="card" aria-labelledby="channel-heading">
      <h2 id="channel-heading">Channel number ↔ frequency</h2>
      <p className="mt-1 text-sm text-ink-600">3GPP channel rasters: TS 36.101 (LTE), TS 38.104 (NR), TS 25.101 (UMTS), TS 45.005 (GSM).</p>
      <form className="mt-4 grid gap-3 sm:grid-cols-3" onSubmit={(e) => e.preventDefault()}>
        <div>
          <label htmlFor="ch-tech" className="field-label">
            Technology
          </label>
          <select id="ch-tech" className="field-input" value={tech} onChange={(e) => setTech(e.target.value as Tech)}>
            {TECHS.map((t) => (
              <option key={t.value} value={t.value}>
                {t.label}
              </option>
            ))}
          </select>
        </div>
        <fieldset>
          <legend className="field-label">Convert from</legend>
          <div className="flex gap-3 pt-2 text-sm">
            <label className="flex items-center gap-1">
              <input type="radio" name="ch-mode" checked={mode === 'channel'} onChange={() => setMode('channel')} /> Channel
            </label>
            <label className="flex items-center gap-1">
              <input type="radio" name="ch-mode" checked={mode === 'frequency'} onChange={() => setMode('frequency')} /> Frequency
            </label>
          </div>
        </fieldset>
        <Field id="ch-value" label={mode === 'channel' ? 'Channel number' : 'Frequency (MHz)'} errors={valueErrors} live>
          <input
            className="field-input"
            inputMode="decimal"
            value={value}
            onChange={(e) => setValue(e.target.value)}
            {...fieldAria({ id: 'ch-value', errors: valueErrors })}
          />
        </Field>
      </form>
      <div className="mt-4" aria-live="polite">
        {result.data && 'band' in result.data && <ChannelView r={result.data} fmt={fmt} />}
        {result.data && 'items' in result.data && <FrequencyView r={result.data} />}
      </div>
    </section>
  );
}

function ChannelView({ r, fmt }: { r: ChannelJson; fmt: (n: number | null) => string }) {
  return (
    <dl data-testid="channel-result">
      <ResultRow label="Band" value={r.band} testId="ch-band" />
      <ResultRow label="Duplex" value={r.duplex} />
      <ResultRow label="Downlink" value={fmt(r.dl_mhz)} unit="MHz" testId="ch-dl" />
      <ResultRow label="Uplink" value={fmt(r.ul_mhz)} unit={r.ul_mhz === null ? undefined : 'MHz'} testId="ch-ul" />
      {r.ul_channel !== null && r.duplex === 'FDD' && <ResultRow label="Paired channel" value={String(r.direction === 'UL' ? r.dl_channel : r.ul_channel)} />}
      {r.alternative_bands.length > 0 && <p className="mt-2 text-sm text-ember-700">Also a valid number in band {r.alternative_bands.join(', ')}.</p>}
      {r.notes.map((n) => (
        <p key={n} className="mt-2 text-sm text-ember-700">
          {n}
        </p>
      ))}
    </dl>
  );
}

function FrequencyView({ r }: { r: FrequencyJson }) {
  return (
    <div data-testid="frequency-result">
      {r.ambiguous && <p className="mb-2 text-sm text-ember-700">{r.freq_mhz} MHz lies in more than one band: the frequency alone does not name the band.</p>}
      <table className="data-table stack">
        <thead>
          <tr>
            <th scope="col">Band</th>
            <th scope="col">Channel</th>
            <th scope="col">Link</th>
            <th scope="col">On raster</th>
          </tr>
        </thead>
        <tbody>
          {r.items.map((i) => (
            <tr key={`${i.band}-${i.direction}`}>
              <td data-label="Band">{i.band}</td>
              <td className="tabular-nums" data-label="Channel">
                {i.channel}
              </td>
              <td data-label="Link">{i.direction === 'both' ? 'DL + UL' : i.direction}</td>
              <td data-label="On raster">{i.exact ? 'yes' : 'nearest'}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
