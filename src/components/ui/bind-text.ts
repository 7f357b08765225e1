// Inputs bound to one form object: each input shows one key, writes it back and shows that key's errors.
import type { ChangeEvent } from 'react';
import type { FieldErrors } from '../../lib/client/api';

type TextKey<F> = { [K in keyof F]: F[K] extends string ? K : never }[keyof F] & string;

/**
 * `bind(key)` gives an input the form's `key` as its value, a change handler that writes it back,
 * and the errors under that key (or under `errorKey` where the request body names it otherwise).
 */
export function bindText<F extends object>(form: F, setForm: (form: F) => void, errors: FieldErrors) {
  const choice = bindChoice(form, setForm, errors);
  return (key: TextKey<F>, errorKey: string = key) => {
    const { onChange, ...bound } = choice(key, errorKey);
    return { ...bound, value: bound.value as string, onChange: (e: ChangeEvent<HTMLInputElement>) => onChange(e.target.value as F[typeof key]) };
  };
}

/** The same for a choice of fixed values (`SelectField`), whose change handler takes the value chosen. */
export function bindChoice<F extends object>(form: F, setForm: (form: F) => void, errors: FieldErrors) {
  return <K extends keyof F & string>(key: K, errorKey: string = key) => ({
    value: form[key],
    onChange: (value: F[K]) => setForm({ ...form, [key]: value }),
    errors: errors[errorKey],
  });
}
