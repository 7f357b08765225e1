import { useState, type FormEvent } from 'react';
import { useIsLive } from '../ui/use-is-live';
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
  const live = useIsLive();
  const { busy, fields, error, submit } = useAccountSubmit(SignupSchema, (b) => accountsApi.signup({ name: b.name!, email: b.email!, password: b.password! }));

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
      <AccountField
        id="su-name"
        label="Your name"
        autoComplete="name"
        value={form.name}
        onChange={(e) => setForm({ ...form, name: e.target.value })}
        errors={fields.name}
      />
      <AccountField
        id="su-email"
        label="E-mail"
        type="email"
        inputMode="email"
        autoComplete="email"
        value={form.email}
        onChange={(e) => setForm({ ...form, email: e.target.value })}
        errors={fields.email}
      />
      <AccountField
        id="su-password"
        label="Password"
        type="password"
        autoComplete="new-password"
        hint={`At least ${PASSWORD_MIN} characters. A few unrelated words are easy to remember and hard to guess.`}
        value={form.password}
        onChange={(e) => setForm({ ...form, password: e.target.value })}
        errors={fields.password}
      />
      <button type="submit" className="btn-primary min-h-11 w-full" disabled={busy || !live}>
        {busy ? 'Sending…' : 'Sign up'}
      </button>
    </form>
  );
}
