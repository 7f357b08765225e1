import { useEffect, useRef, useState, type FormEvent } from 'react';
import { cellsApi } from '../../lib/client/masts-api';
import { checkWith } from '../../lib/client/api';
import type { CellJson } from '../../lib/schemas/masts';
import { TECHS, type Tech } from '../../lib/schemas/mast-enums';
import { CellInputSchema } from '../../lib/schemas/masts';
import { bandChoices, bandForTech, cellDraftOf, cellInputOf, changedCellFields, describeChannel, newCellDraft, type CellDraft } from './cell-form';
import { Field, FormActions, FormAlert, OperatorOptions, inputProps } from './form-parts';
import { ChoiceOptions } from '../ui/field';
import { TECH_LABELS } from './MapFilters';
import type { OperatorMark } from './mast-icons';
import { useMapForm } from './use-map-form';

interface Props {
  mastId: string;
  /** The cell to edit; none to add one. */
  cell: CellJson | null;
  operators: readonly OperatorMark[];
  onSaved: () => void;
  onCancel: () => void;
  /** Editing: asks to remove the cell (the caller confirms first). */
  onRemove?: () => void;
}

/** What each technology calls its channel number. */
const CHANNEL_NAME: Record<Tech, string> = { gsm: 'ARFCN', umts: 'UARFCN', lte: 'EARFCN', nr: 'NR-ARFCN' };

/** Adds or edits one cell; checked with the API's schema (channel in band, PCI range) before it is sent. */
export default function CellForm({ mastId, cell, operators, onSaved, onCancel, onRemove }: Props) {
  const [initial] = useState<CellDraft>(() => (cell ? cellDraftOf(cell) : newCellDraft(operators[0]?.id ?? '')));
  const [draft, setDraft] = useState(initial);
  const form = useMapForm('Could not save the cell');
  const errors = form.errors;
  const firstRef = useRef<HTMLSelectElement>(null);
  const title = cell ? `Edit ${cell.tech.toUpperCase()} ${cell.band} cell, channel ${cell.channel}` : 'New cell';

  useEffect(() => firstRef.current?.focus(), []);

  const change = (key: keyof CellDraft, value: string) => {
    setDraft((d) => (key === 'tech' ? { ...d, tech: value as Tech, band: bandForTech(value as Tech, d.band) } : ({ ...d, [key]: value } as CellDraft)));
    // Band, channel and PCI are checked together: a change to one may settle the others' errors.
    form.clear(key === 'tech' || key === 'band' || key === 'channel' ? [key, 'tech', 'band', 'channel', 'pci'] : [key]);
  };
  const input = (k: keyof CellDraft, extra: Record<string, unknown> = {}) => inputProps('cell', draft, errors, change, k, extra);
  const channelHint = describeChannel(draft.tech, draft.channel, draft.band);

  async function submit(e: FormEvent) {
    e.preventDefault();
    // The whole cell is checked either way: the server checks an edit merged with the stored cell.
    const whole = cellInputOf(draft);
    const change = cell ? changedCellFields(initial, draft) : whole;
    if (cell && Object.keys(change).length === 0 && !checkWith(CellInputSchema, whole)) {
      onCancel();
      return;
    }
    const sent = await form.submit(() => (cell ? cellsApi.update(cell.id, { row_version: cell.row_version, ...change }) : cellsApi.create(mastId, whole)), {
      check: () => checkWith(CellInputSchema, whole),
    });
    if (sent.ok) onSaved();
  }

  return (
    <form onSubmit={submit} noValidate className="space-y-3 rounded-lg border border-ink-200 bg-ink-50 p-3" aria-label={title} data-testid="cell-form">
      <h4 className="font-semibold text-ink-900">{title}</h4>
      <FormAlert message={form.message} errors={errors._}>
        {form.stale && (
          <button type="button" className="btn-secondary mt-2 py-1" onClick={onSaved}>
            Load the latest version
          </button>
        )}
      </FormAlert>
      <div className="grid grid-cols-2 gap-3">
        <Field id="cell-operator_id" label="Operator" errors={errors.operator_id}>
          <select {...input('operator_id')} ref={firstRef}>
            <OperatorOptions operators={operators} />
          </select>
        </Field>
        <Field id="cell-tech" label="Technology" errors={errors.tech}>
          <select {...input('tech')}>
            <ChoiceOptions values={TECHS} labels={TECH_LABELS} />
          </select>
        </Field>
        <Field id="cell-channel" label={`Channel (${CHANNEL_NAME[draft.tech]})`} errors={errors.channel} hint={channelHint}>
          <input
            {...input('channel', {
              inputMode: 'numeric',
              required: true,
              autoComplete: 'off',
              'aria-describedby': errors.channel ? 'cell-channel-error' : channelHint ? 'cell-channel-hint' : undefined,
            })}
          />
        </Field>
        <Field id="cell-band" label="Band" errors={errors.band}>
          <select {...input('band')}>
            <option value="">From the channel</option>
            {bandChoices(draft.tech).map((b) => (
              <option key={b} value={b}>
                {b}
              </option>
            ))}
          </select>
        </Field>
        <Field id="cell-pci" label={draft.tech === 'umts' ? 'Scrambling code' : 'PCI'} errors={errors.pci}>
          <input {...input('pci', { inputMode: 'numeric' })} />
        </Field>
        <Field id="cell-sector_azimuth_deg" label="Azimuth (°)" errors={errors.sector_azimuth_deg}>
          <input {...input('sector_azimuth_deg', { inputMode: 'decimal' })} />
        </Field>
        <Field id="cell-antenna_height_m" label="Antenna height (m)" errors={errors.antenna_height_m}>
          <input {...input('antenna_height_m', { inputMode: 'decimal' })} />
        </Field>
        <Field id="cell-bandwidth_mhz" label="Bandwidth (MHz)" errors={errors.bandwidth_mhz}>
          <input {...input('bandwidth_mhz', { inputMode: 'decimal' })} />
        </Field>
        <Field id="cell-rs_power_dbm" label="RS power (dBm)" errors={errors.rs_power_dbm}>
          <input {...input('rs_power_dbm', { inputMode: 'decimal' })} />
        </Field>
        <Field id="cell-cell_identity" label="Cell identity" errors={errors.cell_identity}>
          <input {...input('cell_identity', { inputMode: 'numeric' })} />
        </Field>
      </div>
      <FormActions submitLabel={cell ? 'Save cell' : 'Add cell'} busy={form.pending} onCancel={onCancel}>
        {onRemove && (
          <button type="button" className="btn-secondary ml-auto text-alarm-700" onClick={onRemove} disabled={form.pending}>
            Remove cell…
          </button>
        )}
      </FormActions>
    </form>
  );
}
