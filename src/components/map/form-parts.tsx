import type { ReactNode } from 'react';
import type { FieldErrors } from '../../lib/client/api';

export { Field } from '../ui/field';

/** Props that tie an input to its draft value and its errors. */
export function inputProps<D extends Record<string, string>>(
  prefix: string,
  draft: D,
  errors: FieldErrors,
  onChange: (key: keyof D & string, value: string) => void,
  key: keyof D & string,
  extra: Record<string, unknown> = {},
) {
  const id = `${prefix}-${key}`;
  return {
    id,
    name: key,
    value: draft[key],
    onChange: (e: { target: { value: string } }) => onChange(key, e.target.value),
    className: 'field-input',
    'aria-invalid': !!errors[key],
    'aria-describedby': errors[key] ? `${id}-error` : undefined,
    ...extra,
  };
}

/** The errors left once the named fields have been changed (their old messages no longer apply). */
export function withoutFields(errors: FieldErrors, keys: readonly string[]): FieldErrors {
  if (!keys.some((k) => k in errors)) return errors;
  return Object.fromEntries(Object.entries(errors).filter(([k]) => !keys.includes(k)));
}

/** The form's own message (and messages not tied to a field) above the fields. */
export function FormAlert({ message, errors, children }: { message: string | null; errors?: string[]; children?: ReactNode }) {
  if (!message) return null;
  return (
    <div role="alert" className="rounded-md border border-alarm-100 bg-alarm-50 p-2 text-sm text-alarm-700">
      {message}
      {errors?.map((m) => (
        <p key={m}>{m}</p>
      ))}
      {children}
    </div>
  );
}

/** The form's buttons: send, cancel, and anything else (e.g. remove) after them. */
export function FormActions({ submitLabel, busy, onCancel, children }: { submitLabel: string; busy: boolean; onCancel: () => void; children?: ReactNode }) {
  return (
    <div className="flex flex-wrap gap-2">
      <button type="submit" className="btn-primary" disabled={busy}>
        {submitLabel}
      </button>
      <button type="button" className="btn-secondary" onClick={onCancel} disabled={busy}>
        Cancel
      </button>
      {children}
    </div>
  );
}

/** The operators as a select's options. */
export function OperatorOptions({ operators }: { operators: readonly { id: string; name: string }[] }) {
  return (
    <>
      {operators.map((o) => (
        <option key={o.id} value={o.id}>
          {o.name}
        </option>
      ))}
    </>
  );
}
