import { useState, type FormEvent, type ReactNode } from 'react';
import { ApiError, mastsApi, type FieldErrors, type MastDetailJson } from '../../lib/client/api';
import { MAST_STATUSES, MAST_STATUS_LABELS, STRUCTURE_TYPES, STRUCTURE_TYPE_LABELS } from '../../lib/schemas/mast-enums';
import { MastChangeSchema } from '../../lib/schemas/masts';

interface Props {
  mast: MastDetailJson;
  onSaved: () => void;
  onCancel: () => void;
}

type Draft = Record<'name' | 'reference' | 'status' | 'structure_type' | 'structure_height_m' | 'ground_elevation_m' | 'lat' | 'lon' | 'access_notes', string>;

const numText = (v: number | null) => (v === null ? '' : String(v));

function draftOf(m: MastDetailJson): Draft {
  return {
    name: m.name,
    reference: m.reference ?? '',
    status: m.status,
    structure_type: m.structure_type,
    structure_height_m: numText(m.structure_height_m),
    ground_elevation_m: numText(m.ground_elevation_m),
    lat: m.lat.toFixed(6),
    lon: m.lon.toFixed(6),
    access_notes: m.access_notes ?? '',
  };
}

/** A number field's text as the API wants it: blank means "not known" where that is allowed. */
const toNumber = (text: string, nullable: boolean) => (text.trim() === '' ? (nullable ? null : Number.NaN) : Number(text.replace(',', '.')));

/** The fields that differ from the stored mast, in the API's names. */
function changedFields(before: Draft, after: Draft): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  const text = (k: 'name' | 'reference' | 'status' | 'structure_type' | 'access_notes') => {
    if (after[k] !== before[k]) out[k] = after[k].trim() === '' && k !== 'name' ? null : after[k];
  };
  (['name', 'reference', 'status', 'structure_type', 'access_notes'] as const).forEach(text);
  for (const k of ['structure_height_m', 'ground_elevation_m'] as const) if (after[k] !== before[k]) out[k] = toNumber(after[k], true);
  if (after.lat !== before.lat || after.lon !== before.lon) {
    out.lat = toNumber(after.lat, false);
    out.lon = toNumber(after.lon, false);
  }
  return out;
}

function Field({ id, label, errors, children }: { id: string; label: string; errors?: string[]; children: ReactNode }) {
  return (
    <div>
      <label htmlFor={id} className="field-label">
        {label}
      </label>
      {children}
      {errors?.map((m) => (
        <p key={m} id={`${id}-error`} className="field-error">
          {m}
        </p>
      ))}
    </div>
  );
}

/** Edits a mast's own facts; a stale edit (someone saved first) is refused by the server. */
export default function MastEditForm({ mast, onSaved, onCancel }: Props) {
  const [initial] = useState(() => draftOf(mast));
  const [draft, setDraft] = useState(initial);
  const [errors, setErrors] = useState<FieldErrors>({});
  const [formError, setFormError] = useState<string | null>(null);
  const [stale, setStale] = useState(false);
  const [busy, setBusy] = useState(false);

  const set = (k: keyof Draft) => (e: { target: { value: string } }) => setDraft({ ...draft, [k]: e.target.value });
  const input = (k: keyof Draft, extra: Record<string, unknown> = {}) => ({
    id: `mast-${k}`,
    value: draft[k],
    onChange: set(k),
    className: 'field-input',
    'aria-invalid': !!errors[k],
    'aria-describedby': errors[k] ? `mast-${k}-error` : undefined,
    ...extra,
  });

  async function submit(e: FormEvent) {
    e.preventDefault();
    setErrors({});
    setFormError(null);
    const change = { row_version: mast.row_version, ...changedFields(initial, draft) };
    if (Object.keys(change).length === 1) {
      onCancel();
      return;
    }
    const checked = MastChangeSchema.safeParse(change);
    if (!checked.success) {
      const fields: FieldErrors = {};
      for (const issue of checked.error.issues) (fields[String(issue.path[0] ?? '_')] ??= []).push(issue.message);
      setErrors(fields);
      setFormError('Some fields need attention');
      return;
    }
    setBusy(true);
    try {
      await mastsApi.update(mast.id, change);
      onSaved();
    } catch (err) {
      if (err instanceof ApiError) {
        setErrors(err.fields);
        setFormError(err.message);
        setStale(err.status === 409);
      } else setFormError('Could not save the mast');
    } finally {
      setBusy(false);
    }
  }

  return (
    <form onSubmit={submit} noValidate className="space-y-3" aria-label={`Edit ${mast.name}`} data-testid="mast-edit-form">
      {formError && (
        <div role="alert" className="rounded-md border border-alarm-100 bg-alarm-50 p-2 text-sm text-alarm-700">
          {formError}
          {errors._?.map((m) => (
            <p key={m}>{m}</p>
          ))}
          {stale && (
            <button type="button" className="btn-secondary mt-2 py-1" onClick={onSaved}>
              Load the latest version
            </button>
          )}
        </div>
      )}
      <Field id="mast-name" label="Name" errors={errors.name}>
        <input {...input('name')} />
      </Field>
      <div className="grid grid-cols-2 gap-3">
        <Field id="mast-reference" label="Reference" errors={errors.reference}>
          <input {...input('reference')} />
        </Field>
        <Field id="mast-status" label="Status" errors={errors.status}>
          <select {...input('status')}>
            {MAST_STATUSES.map((s) => (
              <option key={s} value={s}>
                {MAST_STATUS_LABELS[s]}
              </option>
            ))}
          </select>
        </Field>
      </div>
      <div className="grid grid-cols-2 gap-3">
        <Field id="mast-structure_type" label="Structure" errors={errors.structure_type}>
          <select {...input('structure_type')}>
            {STRUCTURE_TYPES.map((t) => (
              <option key={t} value={t}>
                {STRUCTURE_TYPE_LABELS[t]}
              </option>
            ))}
          </select>
        </Field>
        <Field id="mast-structure_height_m" label="Height (m)" errors={errors.structure_height_m}>
          <input {...input('structure_height_m', { inputMode: 'decimal' })} />
        </Field>
      </div>
      <div className="grid grid-cols-3 gap-3">
        <Field id="mast-lat" label="Latitude" errors={errors.lat}>
          <input {...input('lat', { inputMode: 'decimal' })} />
        </Field>
        <Field id="mast-lon" label="Longitude" errors={errors.lon}>
          <input {...input('lon', { inputMode: 'decimal' })} />
        </Field>
        <Field id="mast-ground_elevation_m" label="Ground (m)" errors={errors.ground_elevation_m}>
          <input {...input('ground_elevation_m', { inputMode: 'decimal' })} />
        </Field>
      </div>
      <Field id="mast-access_notes" label="Access notes" errors={errors.access_notes}>
        <textarea rows={3} {...input('access_notes')} />
      </Field>
      <div className="flex gap-2">
        <button type="submit" className="btn-primary" disabled={busy}>
          Save mast
        </button>
        <button type="button" className="btn-secondary" onClick={onCancel} disabled={busy}>
          Cancel
        </button>
      </div>
    </form>
  );
}
