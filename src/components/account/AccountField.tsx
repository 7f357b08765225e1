import type { InputHTMLAttributes } from 'react';

interface Props extends InputHTMLAttributes<HTMLInputElement> {
  id: string;
  label: string;
  hint?: string;
  errors?: string[];
}

/** One labelled input with its hint and inline errors, sized for thumbs on a phone. */
export default function AccountField({ id, label, hint, errors, ...input }: Props) {
  const described = [hint ? `${id}-hint` : null, errors?.length ? `${id}-error` : null].filter(Boolean).join(' ') || undefined;
  return (
    <div>
      <label htmlFor={id} className="field-label">
        {label}
      </label>
      <input
        id={id}
        className="field-input min-h-11 text-base sm:text-sm"
        aria-invalid={errors?.length ? true : undefined}
        aria-describedby={described}
        {...input}
      />
      {hint && (
        <p id={`${id}-hint`} className="mt-1 text-xs text-ink-500">
          {hint}
        </p>
      )}
      {errors?.length ? (
        <p id={`${id}-error`} className="field-error">
          {errors.join(' ')}
        </p>
      ) : null}
    </div>
  );
}
