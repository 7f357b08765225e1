import { useState, type FormEvent } from 'react';
import { bindText } from '../ui/bind-text';
import { SubmitButton } from '../ui/SubmitButton';
import { accountsApi } from '../../lib/client/accounts-api';
import { SignupSchema } from '../../lib/schemas/accounts';
import { PASSWORD_MIN } from '../../lib/schemas/users';
import AccountField from './AccountField';
import FormAlert from './FormAlert';
import { useAccountSubmit } from './useAccountSubmit';

/** Contributor sign-up: name, e-mail and password; the account exists once the mailed link is followed. */
export default function SignupForm() {
  const [form, setForm] = useState({ name: '', email: '', password: '' });
  const [done, setDone] = useState<string | null>(null);
  const { busy, fields, error, submit } = useAccountSubmit(SignupSchema, (b) => accountsApi.signup({ name: b.name!, email: b.email!, password: b.password! }));

  const field = bindText(form, setForm, fields);

  async function onSubmit(e: FormEvent) {
    e.preventDefault();
    const answer = await submit(form);
    if (answer) setDone(answer.message);
  }

  if (done) {
    return (
      <div className="card space-y-3" data-testid="signup-done">
        <h2>Check your mail</h2>
        <FormAlert notice={done} />
        <p className="text-sm text-ink-600">You can close this page. The link in the message finishes your sign-up.</p>
      </div>
    );
  }

  return (
    <form className="card space-y-4" onSubmit={onSubmit} noValidate>
      <FormAlert error={error} />
      <AccountField id="su-name" label="Your name" autoComplete="name" {...field('name')} />
      <AccountField id="su-email" label="E-mail" type="email" inputMode="email" autoComplete="email" {...field('email')} />
      <AccountField
        id="su-password"
        label="Password"
        type="password"
        autoComplete="new-password"
        hint={`At least ${PASSWORD_MIN} characters. A few unrelated words are easy to remember and hard to guess.`}
        {...field('password')}
      />
      <SubmitButton pending={busy} label={busy ? 'Sending…' : 'Sign up'} className="btn-primary min-h-11 w-full" />
    </form>
  );
}
