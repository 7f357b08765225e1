import { useState, type FormEvent } from 'react';
import { accountsApi } from '../../lib/client/accounts-api';
import { VerifySchema } from '../../lib/schemas/accounts';
import { SubmitButton } from '../ui/SubmitButton';
import FormAlert from './FormAlert';
import { useAccountSubmit } from './useAccountSubmit';

interface Props {
  token: string;
  email: string;
}

// A button rather than confirming on page load: mail scanners open links, and a scanner must
// not use up the link.
export default function VerifyForm({ token, email }: Props) {
  const [done, setDone] = useState(false);
  const { busy, error, submit } = useAccountSubmit(VerifySchema, (b) => accountsApi.verify({ token: b.token! }));

  async function onSubmit(e: FormEvent) {
    e.preventDefault();
    if (await submit({ token })) {
      setDone(true);
      window.location.assign('/');
    }
  }

  return (
    <form className="card space-y-4" onSubmit={onSubmit}>
      <FormAlert error={error} notice={done ? 'Confirmed. Opening Bearline…' : null} />
      <p className="text-sm text-ink-700">
        Confirm that <strong className="break-all">{email}</strong> is your address to finish your contributor account.
      </p>
      <SubmitButton pending={busy || done} label={busy ? 'Confirming…' : 'Confirm my e-mail'} className="btn-primary min-h-11 w-full" />
    </form>
  );
}
