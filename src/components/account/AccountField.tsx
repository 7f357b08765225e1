import type { InputHTMLAttributes } from 'react';
import { Field, fieldAria, type FieldFrame } from '../ui/field';

type Props = Omit<InputHTMLAttributes<HTMLInputElement>, 'id'> & FieldFrame;

/** One labelled input with its hint and inline errors, sized for thumbs on a phone. */
export default function AccountField({ id, label, hint, errors, ...input }: Props) {
  return (
    <Field id={id} label={label} errors={errors} hint={hint}>
      <input className="field-input min-h-11 text-base sm:text-sm" {...fieldAria({ id, errors, hint })} {...input} />
    </Field>
  );
}
