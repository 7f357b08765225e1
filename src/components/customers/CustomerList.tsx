import { useState } from 'react';
import { customersApi } from '../../lib/client/customers-api';
import type { CustomerJson } from '../../lib/schemas/customers';
import { PLAN_STATES, PLAN_STATE_LABELS, isPlanState, type PlanState } from '../../lib/domain/plan-state';
import { formatDate } from '../../lib/domain/format';
import { SortableTable, type Column } from '../ui/SortableTable';
import { useDebounced } from '../tools/useDebounced';
import { useQuery } from '../ui/use-api';
import CustomerForm from './CustomerForm';
import { PlanStateBadge } from './PlanStateBadge';

// Enough for a team's working list; beyond it the search narrows things down.
const LOAD_LIMIT = 200;

interface Props {
  canWrite: boolean;
  /** From the page's `?state=` parameter, so that links to a filtered list work. */
  initialState?: PlanState | null;
}

/** Keeps the filter in the address bar (replacing the entry: typing is not a step back). */
function writeStateToUrl(state: PlanState | null) {
  const url = new URL(window.location.href);
  if (state) url.searchParams.set('state', state);
  else url.searchParams.delete('state');
  window.history.replaceState(window.history.state, '', url);
}

export default function CustomerList({ canWrite, initialState = null }: Props) {
  const [query, setQuery] = useState('');
  const [state, setState] = useState<PlanState | null>(initialState);
  const q = useDebounced(query.trim(), 250);
  const list = useQuery(JSON.stringify([q, state]), () => customersApi.list({ q, state: state ?? undefined, sort: 'updated_at', limit: LOAD_LIMIT }), {
    failed: 'Could not load customers',
  });
  const data = list.data;
  const error = list.error?.message;

  const columns: Column<CustomerJson>[] = [
    {
      key: 'name',
      label: 'Customer',
      sortValue: (c) => c.name.toLowerCase(),
      render: (c) => (
        <a href={`/customers/${c.id}`} className="font-semibold text-ink-800 underline decoration-ink-300 underline-offset-2 hover:decoration-ink-700">
          {c.name}
        </a>
      ),
    },
    {
      key: 'address',
      label: 'Address',
      sortValue: (c) => c.address_label.toLowerCase(),
      render: (c) => (
        <span>
          {c.address_label}
          {c.postcode && <span className="ml-1 whitespace-nowrap text-ink-500">{c.postcode}</span>}
        </span>
      ),
      className: 'hidden sm:table-cell',
    },
    {
      key: 'state',
      label: 'Plan',
      sortValue: (c) => (c.latest_plan_state ? PLAN_STATES.indexOf(c.latest_plan_state) : null),
      render: (c) =>
        c.latest_plan_state ? (
          <span className="flex flex-wrap items-center gap-1">
            <PlanStateBadge state={c.latest_plan_state} />
            {c.plan_count > 1 && <span className="text-xs text-ink-500">+{c.plan_count - 1} more</span>}
          </span>
        ) : (
          <span className="text-ink-500">No plan</span>
        ),
    },
    {
      key: 'current',
      label: 'Today',
      sortValue: (c) => c.current_operator_name,
      render: (c) =>
        c.current_operator_name || c.current_antenna_name ? (
          [c.current_operator_name, c.current_antenna_name].filter(Boolean).join(' · ')
        ) : (
          <span className="text-ink-500">—</span>
        ),
      className: 'hidden md:table-cell',
    },
    {
      key: 'updated',
      label: 'Updated',
      sortValue: (c) => c.updated_at,
      render: (c) => (
        <time dateTime={c.updated_at} className="whitespace-nowrap">
          {formatDate(c.updated_at)}
        </time>
      ),
      className: 'hidden sm:table-cell',
    },
  ];

  return (
    <div className={`mt-6 grid gap-6 ${canWrite ? 'lg:grid-cols-[1fr_24rem]' : ''}`}>
      <section className="card min-w-0" aria-labelledby="customers-heading">
        <div className="mb-3 flex flex-wrap items-center gap-3">
          <h2 id="customers-heading">Customers {data && <span className="font-normal text-ink-600">({data.total})</span>}</h2>
          <label className="w-full sm:ml-auto sm:w-auto">
            <span className="sr-only">Plan state</span>
            <select
              className="field-input w-full sm:w-auto"
              value={state ?? ''}
              onChange={(e) => {
                const next = isPlanState(e.target.value) ? e.target.value : null;
                setState(next);
                writeStateToUrl(next);
              }}
              data-testid="customer-state-filter"
            >
              <option value="">Any plan state</option>
              {PLAN_STATES.map((s) => (
                <option key={s} value={s}>
                  Plan: {PLAN_STATE_LABELS[s]}
                </option>
              ))}
            </select>
          </label>
          <label className="w-full sm:w-auto">
            <span className="sr-only">Search customers</span>
            <input
              type="search"
              placeholder="Name, address, postcode, phone, e-mail"
              className="field-input w-full sm:w-80"
              value={query}
              onChange={(e) => setQuery(e.target.value)}
              data-testid="customer-search"
            />
          </label>
        </div>
        {error ? (
          <p role="alert" className="text-alarm-700">
            {error}
          </p>
        ) : !data ? (
          <p className="text-ink-500">Loading customers…</p>
        ) : (
          <>
            <SortableTable
              rows={data.items}
              columns={columns}
              rowKey={(c) => c.id}
              initialSort={{ key: 'updated', dir: 'desc' }}
              empty={q || state ? 'No customer matches your search' : 'No customers yet'}
              caption="Customers"
            />
            {data.total > data.items.length && (
              <p className="mt-2 text-sm text-ink-600">
                Showing the {data.items.length} most recently changed of {data.total}; search to narrow the list.
              </p>
            )}
          </>
        )}
      </section>
      {canWrite && (
        <section className="card min-w-0 self-start" aria-labelledby="new-customer-heading">
          <h2 id="new-customer-heading">New customer</h2>
          <div className="mt-3">
            <CustomerForm
              customer={null}
              submitLabel="Create customer"
              onSave={async (body) => {
                const created = await customersApi.create(body);
                window.location.assign(`/customers/${created.id}`);
              }}
            />
          </div>
        </section>
      )}
    </div>
  );
}
