import { useState } from 'react';
import { usersApi } from '../../lib/client/users-api';
import type { UserListItemJson } from '../../lib/schemas/users';
import { ROLES, ROLE_LABELS, type Role } from '../../lib/domain/roles';
import { TOKEN_LIFETIME_MIN } from '../../lib/domain/account-tokens';
import type { Column } from '../ui/SortableTable';
import { bindChoice, bindText } from '../ui/bind-text';
import { useQuery, useSubmit } from '../ui/use-api';
import { formatDate } from '../../lib/domain/format';
import { FormCard, InputField, ListBesideForm, ListCard, SelectField, upsertById, useNotice } from './parts';

interface Props {
  currentUserId: string;
}

const EMPTY_FORM = { email: '', name: '', role: 'planner' as Role };

export default function UsersAdmin({ currentUserId }: Props) {
  const users = useQuery('users', () => usersApi.list().then((r) => r.items));
  const inviting = useSubmit({ failed: 'Could not invite the user' });
  const { notice, setNotice, attempt } = useNotice();
  const [form, setForm] = useState(EMPTY_FORM);
  const field = bindText(form, setForm, inviting.fields);
  const choice = bindChoice(form, setForm, inviting.fields);

  const replace = (u: UserListItemJson) => users.setData((list) => upsertById(list, u));

  const change = (u: UserListItemJson, patch: { role?: Role; disabled?: boolean }) =>
    attempt(async () => {
      const updated = await usersApi.update(u.id, patch);
      replace(updated);
      return `${updated.name}: ${patch.role ? `role set to ${ROLE_LABELS[updated.role]}` : updated.disabled_at ? 'disabled' : 'enabled'}`;
    }, 'Could not save the change');

  async function create() {
    const result = await inviting.submit(() => usersApi.invite(form));
    if (!result.ok) return;
    const created = result.data;
    replace(created);
    setForm(EMPTY_FORM);
    setNotice(
      created.mail_sent
        ? `Invited ${created.name} (${ROLE_LABELS[created.role]}): a link to choose a password is on its way to ${created.email}`
        : `Made ${created.name}'s account, but the invitation could not be mailed. Try "Resend invitation".`,
    );
  }

  const resend = (u: UserListItemJson) =>
    attempt(async () => {
      const updated = await usersApi.resendInvite(u.id);
      replace(updated);
      return updated.mail_sent ? `New invitation sent to ${updated.email}; older links no longer work` : 'The invitation could not be mailed. Try again later.';
    }, 'Could not send the invitation');

  const columns: Column<UserListItemJson>[] = [
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

  return (
    <ListBesideForm>
      <ListCard
        id="users"
        title="Accounts"
        notice={notice}
        list={users}
        columns={columns}
        empty="No users yet"
        caption="Users"
        search={{
          label: 'Search users',
          placeholder: 'Search name, e-mail, role',
          text: (u) => `${u.name} ${u.email} ${u.role}`,
          noMatch: 'No user matches your search',
        }}
      />
      <FormCard
        id="new-user"
        title="Invite a user"
        intro={`They get an e-mail with a link to choose their own password. The link works for ${TOKEN_LIFETIME_MIN.invite / 1440} days.`}
        onSubmit={create}
        sending={inviting}
        submitLabel="Send invitation"
        pendingLabel="Inviting…"
      >
        <InputField id="nu-name" label="Name" {...field('name')} />
        <InputField id="nu-email" label="E-mail" type="email" {...field('email')} />
        <SelectField id="nu-role" label="Role" options={ROLES} labels={ROLE_LABELS} {...choice('role')} />
      </FormCard>
    </ListBesideForm>
  );
}
