import { useEffect, useMemo, useState, type FormEvent } from 'react';
import { ApiError, usersApi, type UserDto, type FieldErrors } from '../../lib/client/api';
import { ROLES, ROLE_LABELS, type Role } from '../../lib/domain/roles';
import { TOKEN_LIFETIME_MIN } from '../../lib/domain/account-tokens';
import { SortableTable, type Column } from '../ui/SortableTable';
import { formatDate } from '../../lib/domain/format';

interface Props {
  currentUserId: string;
}

const EMPTY_FORM = { email: '', name: '', role: 'planner' as Role };

export default function UsersAdmin({ currentUserId }: Props) {
  const [users, setUsers] = useState<UserDto[] | null>(null);
  const [loadError, setLoadError] = useState<string | null>(null);
  const [query, setQuery] = useState('');
  const [form, setForm] = useState(EMPTY_FORM);
  const [fieldErrors, setFieldErrors] = useState<FieldErrors>({});
  const [formError, setFormError] = useState<string | null>(null);
  const [notice, setNotice] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  useEffect(() => {
    usersApi.list().then(
      (r) => setUsers(r.items),
      (e: ApiError) => setLoadError(e.message),
    );
  }, []);

  const filtered = useMemo(() => {
    const q = query.trim().toLowerCase();
    if (!users) return [];
    return q ? users.filter((u) => `${u.name} ${u.email} ${u.role}`.toLowerCase().includes(q)) : users;
  }, [users, query]);

  const replace = (u: UserDto) => setUsers((list) => (list ?? []).map((x) => (x.id === u.id ? u : x)));

  async function change(u: UserDto, patch: { role?: Role; disabled?: boolean }) {
    setNotice(null);
    try {
      const updated = await usersApi.update(u.id, patch);
      replace(updated);
      setNotice(`${updated.name}: ${patch.role ? `role set to ${ROLE_LABELS[updated.role]}` : updated.disabled_at ? 'disabled' : 'enabled'}`);
    } catch (e) {
      setNotice(e instanceof ApiError ? e.message : 'Could not save the change');
    }
  }

  async function create(e: FormEvent) {
    e.preventDefault();
    setBusy(true);
    setFieldErrors({});
    setFormError(null);
    try {
      const created = await usersApi.invite(form);
      setUsers((list) => [...(list ?? []), created]);
      setForm(EMPTY_FORM);
      setNotice(
        created.mail_sent
          ? `Invited ${created.name} (${ROLE_LABELS[created.role]}): a link to choose a password is on its way to ${created.email}`
          : `Made ${created.name}'s account, but the invitation could not be mailed. Try "Resend invitation".`,
      );
    } catch (err) {
      if (err instanceof ApiError) {
        setFieldErrors(err.fields);
        setFormError(err.message);
      } else setFormError('Could not invite the user');
    } finally {
      setBusy(false);
    }
  }

  async function resend(u: UserDto) {
    setNotice(null);
    try {
      const updated = await usersApi.resendInvite(u.id);
      replace(updated);
      setNotice(
        updated.mail_sent ? `New invitation sent to ${updated.email}; older links no longer work` : 'The invitation could not be mailed. Try again later.',
      );
    } catch (e) {
      setNotice(e instanceof ApiError ? e.message : 'Could not send the invitation');
    }
  }

  const columns: Column<UserDto>[] = [
    { key: 'name', label: 'Name', sortValue: (u) => u.name.toLowerCase(), render: (u) => <span className="font-semibold">{u.name}</span> },
    { key: 'email', label: 'E-mail', sortValue: (u) => u.email.toLowerCase(), render: (u) => u.email },
    {
      key: 'role',
      label: 'Role',
      sortValue: (u) => u.role,
      render: (u) => (
        <select
          aria-label={`Role of ${u.name}`}
          className="field-input w-auto py-1"
          value={u.role}
          disabled={u.id === currentUserId}
          onChange={(e) => change(u, { role: e.target.value as Role })}
        >
          {ROLES.map((r) => (
            <option key={r} value={r}>
              {ROLE_LABELS[r]}
            </option>
          ))}
        </select>
      ),
    },
    {
      key: 'status',
      label: 'Status',
      sortValue: (u) => (u.disabled_at ? 2 : u.invite ? 1 : 0),
      render: (u) =>
        u.disabled_at ? (
          <span className="rounded bg-alarm-50 px-2 py-0.5 text-alarm-700">Disabled</span>
        ) : u.invite === 'pending' ? (
          <span className="rounded bg-ember-50 px-2 py-0.5 text-ember-700">Invited</span>
        ) : u.invite === 'expired' ? (
          <span className="rounded bg-ember-50 px-2 py-0.5 text-ember-700">Invitation expired</span>
        ) : (
          <span className="rounded bg-moss-50 px-2 py-0.5 text-moss-700">Active</span>
        ),
    },
    { key: 'created', label: 'Since', sortValue: (u) => u.created_at, render: (u) => formatDate(u.created_at) },
    {
      key: 'actions',
      label: 'Actions',
      render: (u) =>
        u.id === currentUserId ? (
          <span className="text-ink-500">You</span>
        ) : (
          <div className="flex flex-wrap gap-2">
            {u.invite && !u.disabled_at && (
              <button type="button" className="btn-secondary py-1" onClick={() => resend(u)} aria-label={`Resend invitation to ${u.name}`}>
                Resend invitation
              </button>
            )}
            <button type="button" className={u.disabled_at ? 'btn-secondary py-1' : 'btn-danger py-1'} onClick={() => change(u, { disabled: !u.disabled_at })}>
              {u.disabled_at ? 'Enable' : 'Disable'}
            </button>
          </div>
        ),
    },
  ];

  const err = (k: string) =>
    fieldErrors[k]?.map((m) => (
      <p key={m} className="field-error" id={`${k}-error`}>
        {m}
      </p>
    ));

  return (
    <div className="mt-6 grid gap-6 lg:grid-cols-[1fr_20rem]">
      <section className="card min-w-0" aria-labelledby="users-heading">
        <div className="mb-3 flex flex-wrap items-center gap-3">
          <h2 id="users-heading">Accounts</h2>
          <label className="flex w-full items-center gap-2 text-sm sm:ml-auto sm:w-auto">
            <span className="sr-only">Search users</span>
            <input
              type="search"
              placeholder="Search name, e-mail, role"
              className="field-input w-full sm:w-64"
              value={query}
              onChange={(e) => setQuery(e.target.value)}
            />
          </label>
        </div>
        <p aria-live="polite" className="mb-2 min-h-5 text-sm text-ink-600" data-testid="users-notice">
          {notice}
        </p>
        {loadError ? (
          <p role="alert" className="text-alarm-700">
            {loadError}
          </p>
        ) : users === null ? (
          <p className="text-ink-500">Loading users…</p>
        ) : (
          <SortableTable
            rows={filtered}
            columns={columns}
            rowKey={(u) => u.id}
            initialSort={{ key: 'name', dir: 'asc' }}
            empty={query ? 'No user matches your search' : 'No users yet'}
            caption="Users"
          />
        )}
      </section>
      <section className="card min-w-0" aria-labelledby="new-user-heading">
        <h2 id="new-user-heading">Invite a user</h2>
        <p className="mt-1 text-sm text-ink-600">
          They get an e-mail with a link to choose their own password. The link works for {TOKEN_LIFETIME_MIN.invite / 1440} days.
        </p>
        <form className="mt-3 space-y-3" onSubmit={create} noValidate>
          {formError && (
            <p role="alert" className="text-sm text-alarm-700">
              {formError}
            </p>
          )}
          <div>
            <label htmlFor="nu-name" className="field-label">
              Name
            </label>
            <input
              id="nu-name"
              className="field-input"
              value={form.name}
              onChange={(e) => setForm({ ...form, name: e.target.value })}
              aria-invalid={!!fieldErrors.name}
              aria-describedby="name-error"
            />
            {err('name')}
          </div>
          <div>
            <label htmlFor="nu-email" className="field-label">
              E-mail
            </label>
            <input
              id="nu-email"
              type="email"
              className="field-input"
              value={form.email}
              onChange={(e) => setForm({ ...form, email: e.target.value })}
              aria-invalid={!!fieldErrors.email}
              aria-describedby="email-error"
            />
            {err('email')}
          </div>
          <div>
            <label htmlFor="nu-role" className="field-label">
              Role
            </label>
            <select id="nu-role" className="field-input" value={form.role} onChange={(e) => setForm({ ...form, role: e.target.value as Role })}>
              {ROLES.map((r) => (
                <option key={r} value={r}>
                  {ROLE_LABELS[r]}
                </option>
              ))}
            </select>
            {err('role')}
          </div>
          <button type="submit" className="btn-primary w-full" disabled={busy}>
            {busy ? 'Inviting…' : 'Send invitation'}
          </button>
        </form>
      </section>
    </div>
  );
}
