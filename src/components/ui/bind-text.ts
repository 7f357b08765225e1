// Text inputs bound to one form object: each input shows one key, writes it back and shows that key's errors.
import type { ChangeEvent } from 'react';
import type { FieldErrors } from '../../lib/client/api';

type TextKey<F> = { [K in keyof F]: F[K] extends string ? K : never }[keyof F] & string;

/**
 * `bind(key)` gives an input the form's `key` as its value, a change handler that writes it back,
 * and the errors under that key (or under `errorKey` where the request body names it otherwise).
 */
export function bindText<F extends object>(form: F, setForm: (form: F) => void, errors: FieldErrors) {
  return (key: TextKey<F>, errorKey: string = key) => ({
    value: form[key] as string,
    onChange: (e: ChangeEvent<HTMLInputElement>) => setForm({ ...form, [key]: e.target.value }),
    errors: errors[errorKey],
  });
}
