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

/** The messages of one field, each on its line, under the id the control is described by. */
export function FieldErrorText({ id, errors }: { id: string; errors?: string[] }) {
  if (!errors?.length) return null;
  return (
    <p className="field-error" id={`${id}-error`}>
      {errors.join(' ')}
    </p>
  );
}

/** A label, the control (give it `fieldAria(…)`), a hint and the field's errors. */
export function Field({ id, label, errors, hint, children }: FieldFrame & { children: ReactNode }) {
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
      <FieldErrorText id={id} errors={errors} />
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
