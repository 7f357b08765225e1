import { useState } from 'react';
import { toolsApi } from '../../lib/client/tools-api';
import type { PathJson } from '../../lib/schemas/tools';
import { useDebounced } from './useDebounced';
import { useQuery } from '../ui/use-api';
import { ResultRow } from './ResultRow';
import { formatNumber } from '../../lib/domain/format';

interface Form {
  from: string;
  to: string;
  freq_mhz: string;
  h1_m: string;
  h2_m: string;
  date: string;
}

const FIELDS: { key: keyof Form; label: string; hint: string; mode: 'decimal' | 'text' }[] = [
  { key: 'from', label: 'Customer antenna (lat, lon)', hint: 'Decimal degrees, e.g. -47.21, -128.52', mode: 'text' },
  { key: 'to', label: 'Mast (lat, lon)', hint: 'Decimal degrees', mode: 'text' },
  { key: 'freq_mhz', label: 'Frequency (MHz)', hint: 'Downlink carrier', mode: 'decimal' },
  { key: 'h1_m', label: 'Customer antenna height (m)', hint: 'Above ground', mode: 'decimal' },
  { key: 'h2_m', label: 'Mast antenna height (m)', hint: 'Above ground', mode: 'decimal' },
  { key: 'date', label: 'Date for declination', hint: 'YYYY-MM-DD', mode: 'text' },
];

const f = formatNumber;

export default function PathCalculator({ today, initialFrom, initialTo }: { today: string; initialFrom?: string; initialTo?: string }) {
  const [form, setForm] = useState<Form>({
    from: initialFrom ?? '',
    to: initialTo ?? '',
    freq_mhz: '806',
    h1_m: '6',
    h2_m: '30',
    date: today,
  });
  const settled = useDebounced(form);
  const key = settled.from.trim() && settled.to.trim() ? JSON.stringify(settled) : null;
  const result = useQuery<PathJson>(key, () => toolsApi.path(settled), { failed: 'Could not calculate', keepOnError: false });

  return (
    <section className="card" aria-labelledby="path-heading">
      <h2 id="path-heading">Path: distance, bearings, clearance</h2>
      <p className="mt-1 text-sm text-ink-600">
        Bearings on the WGS84 ellipsoid approximated on a sphere; magnetic declination from the World Magnetic Model 2025.
      </p>
      <form className="mt-4 grid gap-3 sm:grid-cols-2" onSubmit={(e) => e.preventDefault()} noValidate>
        {FIELDS.map(({ key: k, label, hint, mode }) => {
          const err = result.fields[k]?.[0];
          return (
            <div key={k}>
              <label htmlFor={`path-${k}`} className="field-label">
                {label}
              </label>
              <input
                id={`path-${k}`}
                className="field-input"
                inputMode={mode}
                value={form[k]}
                placeholder={hint}
                onChange={(e) => setForm({ ...form, [k]: e.target.value })}
                aria-invalid={!!err}
                aria-describedby={`path-${k}-hint`}
              />
              {err ? (
                <p id={`path-${k}-hint`} className="field-error" role="alert">
                  {err}
                </p>
              ) : (
                <p id={`path-${k}-hint`} className="mt-1 text-xs text-ink-500">
                  {hint}
                </p>
              )}
            </div>
          );
        })}
      </form>
      {result.error && Object.keys(result.fields).length === 0 && (
        <p className="field-error mt-3" role="alert">
          {result.error.message}
        </p>
      )}
      {!key && <p className="mt-4 text-sm text-ink-500">Enter both ends to see the figures.</p>}
      {result.data && <PathView r={result.data} />}
    </section>
  );
}

function PathView({ r }: { r: PathJson }) {
  return (
    <div className="mt-4 grid gap-4 lg:grid-cols-2" aria-live="polite">
      <dl data-testid="path-result">
        <ResultRow
          label="Distance"
          value={r.distance_m >= 10_000 ? f(r.distance_m / 1000, 2) : f(r.distance_m, 0)}
          unit={r.distance_m >= 10_000 ? 'km' : 'm'}
          testId="path-distance"
        />
        <ResultRow label="Aim: true bearing" value={f(r.bearing_true_deg)} unit="°" testId="path-true" />
        <ResultRow label="Aim: magnetic bearing" value={f(r.bearing_magnetic_deg)} unit="°" testId="path-magnetic" />
        <ResultRow
          label={`Declination (${r.declination_date})`}
          value={`${r.declination_deg >= 0 ? '+' : ''}${f(r.declination_deg, 2)}`}
          unit={r.declination_deg >= 0 ? '° E' : '° W'}
        />
        <ResultRow label="Mast → customer bearing" value={f(r.reverse_bearing_true_deg)} unit="°" />
        <ResultRow label="Elevation angle" value={f(r.elevation_deg, 2)} unit="°" testId="path-elevation" />
      </dl>
      <dl>
        <ResultRow label="Free-space loss" value={r.fspl_db === null ? '—' : f(r.fspl_db)} unit={r.fspl_db === null ? undefined : 'dB'} testId="path-fspl" />
        <ResultRow
          label="1st Fresnel radius (mid-path)"
          value={r.fresnel_radius_mid_m === null ? '—' : f(r.fresnel_radius_mid_m)}
          unit={r.fresnel_radius_mid_m === null ? undefined : 'm'}
        />
        <ResultRow label={`Earth bulge (mid-path, k=${f(r.k, 2)})`} value={f(r.earth_bulge_mid_m, 2)} unit="m" />
        <ResultRow label="Radio horizon of both antennas" value={f(r.radio_horizon_km)} unit="km" />
        {r.terrain ? (
          <ResultRow
            label="Terrain"
            value={r.terrain.status === 'clear' ? 'Clear' : r.terrain.status === 'fresnel' ? 'Fresnel zone infringed' : 'Obstructed'}
          />
        ) : (
          <p className="pt-2 text-xs text-ink-500">{r.terrain_note ?? 'No elevation data covers this path: terrain not checked.'}</p>
        )}
      </dl>
    </div>
  );
}
