import { useState, type FormEvent } from 'react';
import { accountsApi } from '../../lib/client/accounts-api';
import { SetPasswordSchema } from '../../lib/schemas/accounts';
import { PASSWORD_MIN } from '../../lib/schemas/users';
import { SubmitButton } from '../ui/SubmitButton';
import AccountField from './AccountField';
import FormAlert from './FormAlert';
import { useAccountSubmit } from './useAccountSubmit';

interface Props {
  token: string;
  email: string;
  submitLabel: string;
}

/** Chooses a password from a reset or invitation link, then opens Bearline signed in. */
export default function SetPasswordForm({ token, email, submitLabel }: Props) {
  const [password, setPassword] = useState('');
  const [show, setShow] = useState(false);
  const [done, setDone] = useState(false);
  const { busy, fields, error, submit } = useAccountSubmit(SetPasswordSchema, (b) => accountsApi.setPassword({ token: b.token!, password: b.password! }));

  async function onSubmit(e: FormEvent) {
    e.preventDefault();
    if (await submit({ token, password })) {
      setDone(true);
      window.location.assign('/');
    }
  }

  return (
    <form className="card space-y-4" onSubmit={onSubmit} noValidate>
      <FormAlert error={error} notice={done ? 'Password saved. Opening Bearline…' : null} />
      {/* Lets password managers file the new password under the right account. */}
      <input type="email" name="username" autoComplete="username" value={email} readOnly hidden />
      <AccountField
        id="sp-password"
        label="New password"
        type={show ? 'text' : 'password'}
        autoComplete="new-password"
        hint={`At least ${PASSWORD_MIN} characters.`}
        value={password}
        onChange={(e) => setPassword(e.target.value)}
        errors={fields.password}
      />
      <label className="flex min-h-11 items-center gap-2 text-sm text-ink-700">
        <input type="checkbox" className="h-5 w-5" checked={show} onChange={(e) => setShow(e.target.checked)} /> Show the password
      </label>
      <SubmitButton pending={busy || done} label={busy ? 'Saving…' : submitLabel} className="btn-primary min-h-11 w-full" />
    </form>
  );
}
