import { useState, type FormEvent } from 'react';
import type { FieldErrors } from '../../lib/client/api';
import { type InstallCheckBody, plansApi } from '../../lib/client/plans-api';
import { useSubmit } from '../ui/use-api';

interface ReadingRow {
  pci: string;
  channel: string;
  rsrp: string;
  rsrq: string;
  sinr: string;
}

interface SpeedRow {
  down: string;
  up: string;
  latency: string;
}

interface Props {
  planId: string;
  /** Channel and PCI of the planned cell, to fill the first row. */
  defaultChannel: number | null;
  defaultPci: number | null;
  /** Phases the plan's state accepts now. */
  phases: ('before' | 'after')[];
  onSaved: () => void;
}

const blankReading = (channel: number | null, pci: number | null): ReadingRow => ({
  pci: pci === null ? '' : String(pci),
  channel: channel === null ? '' : String(channel),
  rsrp: '',
  rsrq: '',
  sinr: '',
});
const NUMBER = /^[+-]?\d+([.,]\d+)?$/;
const num = (s: string) => (s.trim() === '' ? null : Number(s.trim().replace(',', '.').replace('−', '-')));

/** Field errors for anything typed that is not a number, so nothing is dropped without a word. */
function findTypingErrors(readings: ReadingRow[], speeds: SpeedRow[]): FieldErrors {
  const fields: FieldErrors = {};
  const check = (key: string, label: string, text: string) => {
    const t = text.trim().replace('−', '-');
    if (t !== '' && !NUMBER.test(t)) fields[key] = [`${label} must be a number`];
  };
  readings.forEach((r, i) => {
    check(`readings.${i}.pci`, 'PCI', r.pci);
    check(`readings.${i}.channel`, 'Channel', r.channel);
    check(`readings.${i}.rsrp_dbm`, 'RSRP', r.rsrp);
    check(`readings.${i}.rsrq_db`, 'RSRQ', r.rsrq);
    check(`readings.${i}.sinr_db`, 'SINR', r.sinr);
  });
  speeds.forEach((t, i) => {
    check(`speed_tests.${i}.down_mbps`, 'Download', t.down);
    check(`speed_tests.${i}.up_mbps`, 'Upload', t.up);
    check(`speed_tests.${i}.latency_ms`, 'Latency', t.latency);
  });
  return fields;
}

/** What the form sends: the rows with something typed in them, as numbers. */
function toBody(phase: 'before' | 'after', notes: string, readings: ReadingRow[], speeds: SpeedRow[]): InstallCheckBody {
  return {
    phase,
    notes: notes.trim() || null,
    readings: readings
      .filter((r) => r.pci.trim() || r.rsrp.trim() || r.rsrq.trim() || r.sinr.trim())
      .map((r) => ({ pci: num(r.pci) as number, channel: num(r.channel), rsrp_dbm: num(r.rsrp) as number, rsrq_db: num(r.rsrq), sinr_db: num(r.sinr) })),
    speed_tests: speeds
      .filter((s) => s.down.trim() || s.up.trim())
      .map((s) => ({ down_mbps: num(s.down) as number, up_mbps: num(s.up) as number, latency_ms: num(s.latency) })),
  };
}

/** Before/after readings per PCI and speed tests, typed from the router's status page on site. */
export default function InstallCheckForm({ planId, defaultChannel, defaultPci, phases, onSaved }: Props) {
  const [phase, setPhase] = useState<'before' | 'after'>(phases[0] ?? 'before');
  const [readings, setReadings] = useState<ReadingRow[]>([blankReading(defaultChannel, defaultPci)]);
  const [speeds, setSpeeds] = useState<SpeedRow[]>([]);
  const [notes, setNotes] = useState('');
  const saving = useSubmit({ failed: 'Could not save the check', checkMessage: 'Some values are not numbers' });

  const setReading = (i: number, patch: Partial<ReadingRow>) => setReadings((rows) => rows.map((r, j) => (j === i ? { ...r, ...patch } : r)));
  const setSpeed = (i: number, patch: Partial<SpeedRow>) => setSpeeds((rows) => rows.map((r, j) => (j === i ? { ...r, ...patch } : r)));
  const err = (key: string) => saving.fields[key]?.[0];
  const errors = saving.error;

  async function submit(e: FormEvent) {
    e.preventDefault();
    const result = await saving.submit(() => plansApi.addCheck(planId, toBody(phase, notes, readings, speeds)), {
      check: () => findTypingErrors(readings, speeds),
    });
    if (!result.ok) return;
    setReadings([blankReading(defaultChannel, defaultPci)]);
    setSpeeds([]);
    setNotes('');
    onSaved();
  }

  if (phases.length === 0) return null;
  const cell = (label: string, key: string, value: string, onChange: (v: string) => void, width = 'w-20') => (
    <label className="text-xs">
      <span className="block text-ink-600">{label}</span>
      <input
        className={`field-input ${width} py-1`}
        inputMode="decimal"
        value={value}
        onChange={(e) => onChange(e.target.value)}
        aria-invalid={!!err(key)}
        aria-label={label}
        data-field={key}
      />
      {err(key) && (
        <span className="field-error block" data-testid={`error-${key}`}>
          {err(key)}
        </span>
      )}
    </label>
  );

  return (
    <form className="space-y-3 rounded border border-ink-200 p-3" onSubmit={submit} noValidate aria-label="Record an install check">
      <div className="flex flex-wrap items-center gap-3">
        <h4 className="text-sm font-semibold">Record a check</h4>
        <fieldset className="flex gap-3 text-sm">
          <legend className="sr-only">Phase</legend>
          {phases.map((p) => (
            <label key={p} className="flex items-center gap-1">
              <input type="radio" name={`phase-${planId}`} checked={phase === p} onChange={() => setPhase(p)} />{' '}
              {p === 'before' ? 'Before install' : 'After install'}
            </label>
          ))}
        </fieldset>
      </div>
      <div className="space-y-2">
        <p className="text-xs text-ink-600">Readings per cell (PCI), as the router reports them</p>
        {readings.map((r, i) => (
          <div key={i} className="flex flex-wrap items-end gap-2">
            {cell('PCI', `readings.${i}.pci`, r.pci, (v) => setReading(i, { pci: v }), 'w-16')}
            {cell('Channel', `readings.${i}.channel`, r.channel, (v) => setReading(i, { channel: v }), 'w-24')}
            {cell('RSRP dBm', `readings.${i}.rsrp_dbm`, r.rsrp, (v) => setReading(i, { rsrp: v }))}
            {cell('RSRQ dB', `readings.${i}.rsrq_db`, r.rsrq, (v) => setReading(i, { rsrq: v }))}
            {cell('SINR dB', `readings.${i}.sinr_db`, r.sinr, (v) => setReading(i, { sinr: v }))}
            {readings.length > 1 && (
              <button
                type="button"
                className="btn-secondary px-2 py-1 text-xs"
                onClick={() => setReadings((rows) => rows.filter((_, j) => j !== i))}
                aria-label={`Remove reading ${i + 1}`}
              >
                Remove
              </button>
            )}
          </div>
        ))}
        <button type="button" className="btn-secondary px-2 py-1 text-xs" onClick={() => setReadings((rows) => [...rows, blankReading(defaultChannel, null)])}>
          Add a cell
        </button>
      </div>
      <div className="space-y-2">
        <p className="text-xs text-ink-600">Speed tests</p>
        {speeds.map((s, i) => (
          <div key={i} className="flex flex-wrap items-end gap-2">
            {cell('Down Mbit/s', `speed_tests.${i}.down_mbps`, s.down, (v) => setSpeed(i, { down: v }), 'w-24')}
            {cell('Up Mbit/s', `speed_tests.${i}.up_mbps`, s.up, (v) => setSpeed(i, { up: v }), 'w-24')}
            {cell('Latency ms', `speed_tests.${i}.latency_ms`, s.latency, (v) => setSpeed(i, { latency: v }), 'w-24')}
            <button
              type="button"
              className="btn-secondary px-2 py-1 text-xs"
              onClick={() => setSpeeds((rows) => rows.filter((_, j) => j !== i))}
              aria-label={`Remove speed test ${i + 1}`}
            >
              Remove
            </button>
          </div>
        ))}
        <button type="button" className="btn-secondary px-2 py-1 text-xs" onClick={() => setSpeeds((rows) => [...rows, { down: '', up: '', latency: '' }])}>
          Add a speed test
        </button>
      </div>
      <label className="block text-xs">
        <span className="block text-ink-600">Notes</span>
        <textarea className="field-input" rows={2} value={notes} onChange={(e) => setNotes(e.target.value)} />
      </label>
      {errors && (
        <p role="alert" className="field-error">
          {errors.message}
          {errors.fields.readings ? `: ${errors.fields.readings[0]}` : ''}
        </p>
      )}
      <button type="submit" className="btn-primary py-1.5" disabled={saving.pending}>
        {saving.pending ? 'Saving…' : `Save ${phase === 'before' ? 'before' : 'after'} check`}
      </button>
    </form>
  );
}
