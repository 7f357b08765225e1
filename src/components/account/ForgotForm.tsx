import { useState, type FormEvent } from 'react';
import { accountsApi } from '../../lib/client/accounts-api';
import { ForgotSchema } from '../../lib/schemas/accounts';
import { SubmitButton } from '../ui/SubmitButton';
import AccountField from './AccountField';
import FormAlert from './FormAlert';
import { useAccountSubmit } from './useAccountSubmit';

/** Asks for a reset link; the answer is the same whether or not the address has an account. */
export default function ForgotForm() {
  const [email, setEmail] = useState('');
  const [done, setDone] = useState<string | null>(null);
  const { busy, fields, error, submit } = useAccountSubmit(ForgotSchema, (b) => accountsApi.forgot({ email: b.email! }));

  async function onSubmit(e: FormEvent) {
    e.preventDefault();
    const answer = await submit({ email });
    if (answer) setDone(answer.message);
  }

  return (
    <form className="card space-y-4" onSubmit={onSubmit} noValidate>
      <FormAlert error={error} notice={done} />
      <AccountField
        id="fg-email"
        label="E-mail"
        type="email"
        inputMode="email"
        autoComplete="email"
        value={email}
        onChange={(e) => setEmail(e.target.value)}
        errors={fields.email}
      />
      <SubmitButton pending={busy} label={busy ? 'Sending…' : done ? 'Send again' : 'Send me a link'} className="btn-primary min-h-11 w-full" />
    </form>
  );
}
