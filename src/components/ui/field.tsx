// A labelled form field: label, control, hint and errors, tied together for assistive technology.
import type { ReactNode } from 'react';

export interface FieldFrame {
  id: string;
  label: string;
  errors?: string[];
  hint?: ReactNode;
}

/** The accessibility attributes of a field's control: invalid while it has errors, described by its hint and errors. */
export function fieldAria({ id, errors, hint }: Omit<FieldFrame, 'label'>) {
  const described = [hint ? `${id}-hint` : null, errors?.length ? `${id}-error` : null].filter(Boolean).join(' ');
  return { id, 'aria-invalid': errors?.length ? true : undefined, 'aria-describedby': described || undefined };
}

/**
 * The messages of one field, each on its line, under the id the control is described by. `live`:
 * announced as they appear, for a field checked while it is typed in rather than on submit.
 */
export function FieldErrorText({ id, errors, live }: { id: string; errors?: string[]; live?: boolean }) {
  if (!errors?.length) return null;
  return (
    <p className="field-error" id={`${id}-error`} role={live ? 'alert' : undefined}>
      {errors.join(' ')}
    </p>
  );
}

/** A label, the control (give it `fieldAria(…)`), a hint and the field's errors. */
export function Field({ id, label, errors, hint, live, children }: FieldFrame & { live?: boolean; children: ReactNode }) {
  return (
    <div>
      <label htmlFor={id} className="field-label">
        {label}
      </label>
      {children}
      {hint && (
        <p id={`${id}-hint`} className="mt-1 text-xs text-ink-600">
          {hint}
        </p>
      )}
      <FieldErrorText id={id} errors={errors} live={live} />
    </div>
  );
}

/** A select's options for a fixed list of values, each shown with its words (technologies, kinds). */
export function ChoiceOptions<V extends string>({ values, labels }: { values: readonly V[]; labels: Readonly<Partial<Record<V, string>>> }) {
  return values.map((v) => (
    <option key={v} value={v}>
      {labels[v] ?? v}
    </option>
  ));
}
