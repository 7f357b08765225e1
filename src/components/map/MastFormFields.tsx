import type { ReactNode } from 'react';
import type { FieldErrors } from '../../lib/client/api';
import { MAST_STATUSES, MAST_STATUS_LABELS, STRUCTURE_TYPES, STRUCTURE_TYPE_LABELS } from '../../lib/schemas/mast-enums';
import { Field, inputProps } from './form-parts';
import type { MastDraft } from './mast-form';

interface Props {
  /** Prefix of the inputs' ids (`mast` → `mast-name`, errors at `mast-name-error`). */
  prefix: string;
  draft: MastDraft;
  errors: FieldErrors;
  onChange: (key: keyof MastDraft, value: string) => void;
  /** A line under a field (e.g. where its value came from). */
  hints?: Partial<Record<keyof MastDraft, ReactNode>>;
}

/** A mast's own facts, for adding and for editing. */
export default function MastFormFields({ prefix, draft, errors, onChange, hints = {} }: Props) {
  const input = (k: keyof MastDraft, extra: Record<string, unknown> = {}) => inputProps(prefix, draft, errors, onChange, k, extra);
  const id = (k: keyof MastDraft) => `${prefix}-${k}`;
  return (
    <>
      <Field id={id('name')} label="Name" errors={errors.name}>
        <input {...input('name', { required: true, autoComplete: 'off' })} />
      </Field>
      <div className="grid grid-cols-2 gap-3">
        <Field id={id('reference')} label="Reference" errors={errors.reference}>
          <input {...input('reference', { autoComplete: 'off' })} />
        </Field>
        <Field id={id('status')} label="Status" errors={errors.status}>
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
        <Field id={id('structure_type')} label="Structure" errors={errors.structure_type}>
          <select {...input('structure_type')}>
            {STRUCTURE_TYPES.map((t) => (
              <option key={t} value={t}>
                {STRUCTURE_TYPE_LABELS[t]}
              </option>
            ))}
          </select>
        </Field>
        <Field id={id('structure_height_m')} label="Height (m)" errors={errors.structure_height_m}>
          <input {...input('structure_height_m', { inputMode: 'decimal' })} />
        </Field>
      </div>
      <div className="grid grid-cols-2 gap-3 sm:grid-cols-3">
        <Field id={id('lat')} label="Latitude" errors={errors.lat}>
          <input {...input('lat', { inputMode: 'decimal', required: true })} />
        </Field>
        <Field id={id('lon')} label="Longitude" errors={errors.lon}>
          <input {...input('lon', { inputMode: 'decimal', required: true })} />
        </Field>
        <Field id={id('ground_elevation_m')} label="Ground (m)" errors={errors.ground_elevation_m} hint={hints.ground_elevation_m}>
          <input
            {...input('ground_elevation_m', {
              inputMode: 'decimal',
              'aria-describedby': errors.ground_elevation_m
                ? `${id('ground_elevation_m')}-error`
                : hints.ground_elevation_m
                  ? `${id('ground_elevation_m')}-hint`
                  : undefined,
            })}
          />
        </Field>
      </div>
      <Field id={id('access_notes')} label="Access notes" errors={errors.access_notes}>
        <textarea rows={3} {...input('access_notes')} />
      </Field>
    </>
  );
}
