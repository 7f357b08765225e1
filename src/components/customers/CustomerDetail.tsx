import { useState } from 'react';
import { customersApi } from '../../lib/client/customers-api';
import { plansApi } from '../../lib/client/plans-api';
import type { CustomerJson } from '../../lib/schemas/customers';
import type { PlanDetailJson } from '../../lib/schemas/plans';
import { PLAN_STATE_LABELS } from '../../lib/domain/plan-state';
import { formatDate, formatLatLon } from '../../lib/domain/format';
import { useQuery, useSubmit } from '../ui/use-api';
import CustomerForm from './CustomerForm';
import EraseCustomer from './EraseCustomer';
import { CustomerHistory } from './CustomerHistory';
import { Facts } from './Facts';
import { PlanCard } from './PlanCard';

interface Props {
  customerId: string;
  canWrite: boolean;
  /** Surveyors record install checks without editing plans. */
  canRecord: boolean;
}

interface Loaded {
  customer: CustomerJson;
  plans: PlanDetailJson[];
}

/** The customer and every plan of theirs in full. */
async function loadCustomer(customerId: string): Promise<Loaded> {
  const [customer, list] = await Promise.all([customersApi.get(customerId), plansApi.list({ customer_id: customerId, limit: 50 })]);
  return { customer, plans: await Promise.all(list.items.map((p) => plansApi.get(p.id))) };
}

export default function CustomerDetail({ customerId, canWrite, canRecord }: Props) {
  const detail = useQuery(customerId, () => loadCustomer(customerId), { failed: 'Could not load the customer' });
  // The history is a side panel: when it cannot be read, it shows as empty.
  const history = useQuery(`${customerId}/history`, () => customersApi.history(customerId).then((r) => r.items));
  const opening = useSubmit({ failed: 'Could not open a plan' });
  const [editing, setEditing] = useState(false);
  const [notice, setNotice] = useState<string | null>(null);

  /** A change the server confirmed: shown in place, and the history asked again. */
  const update = (change: (d: Loaded) => Loaded) => {
    detail.setData((d) => d && change(d));
    history.refetch();
  };

  async function newEnquiry() {
    setNotice(null);
    const result = await opening.submit(async () => plansApi.get((await plansApi.create({ customer_id: customerId })).id));
    if (!result.ok) return setNotice(result.error.message);
    update((d) => ({ ...d, plans: [result.data, ...d.plans] }));
    setNotice(`Plan ${result.data.id} opened as an enquiry`);
  }

  if (detail.error)
    return (
      <p role="alert" className="mt-6 text-alarm-700">
        {detail.error.message}
      </p>
    );
  if (!detail.data) return <p className="mt-6 text-ink-500">Loading…</p>;
  const { customer, plans } = detail.data;

  return (
    <div className="mt-4 grid gap-6 lg:grid-cols-[1fr_22rem]">
      <div className="min-w-0 space-y-6">
        <section className="card min-w-0" aria-labelledby="customer-heading">
          <div className="mb-3 flex flex-wrap items-center gap-2">
            <h2 id="customer-heading">Details</h2>
            {canWrite && !editing && !customer.erased_at && (
              <button type="button" className="btn-secondary ml-auto py-1" onClick={() => setEditing(true)}>
                Edit
              </button>
            )}
          </div>
          {customer.erased_at && (
            <p role="note" className="mb-3 rounded bg-ink-50 p-2 text-sm text-ink-700">
              Personal data erased on the customer’s request on {formatDate(customer.erased_at)}. The position is kept only to about 11 km.
            </p>
          )}
          {editing ? (
            <CustomerForm
              customer={customer}
              submitLabel="Save changes"
              onCancel={() => setEditing(false)}
              onSave={async (body) => {
                const saved = await customersApi.update(customer.id, { ...body, row_version: customer.row_version });
                update((d) => ({ ...d, customer: saved }));
                setEditing(false);
                setNotice('Customer saved');
              }}
            />
          ) : (
            <Facts
              items={[
                ['Address', `${customer.address_label}${customer.postcode ? `, ${customer.postcode}` : ''}`],
                ['Position', formatLatLon(customer.lat, customer.lon)],
                [
                  'Phone',
                  customer.phone ? (
                    <a className="underline" href={`tel:${customer.phone.replace(/[^+\d]/g, '')}`}>
                      {customer.phone}
                    </a>
                  ) : (
                    '—'
                  ),
                ],
                [
                  'E-mail',
                  customer.email ? (
                    <a className="underline" href={`mailto:${customer.email}`}>
                      {customer.email}
                    </a>
                  ) : (
                    '—'
                  ),
                ],
                ['Today', [customer.current_operator_name, customer.current_antenna_name].filter(Boolean).join(' · ') || '—'],
                ['Notes', customer.notes ? <span className="whitespace-pre-line">{customer.notes}</span> : '—'],
              ]}
            />
          )}
          {canWrite && !editing && !customer.erased_at && (
            <div className="mt-3 flex border-t border-ink-100 pt-3">
              {/* The name is in the page heading too: erasure loads the page again to show the erased record. */}
              <EraseCustomer customerId={customer.id} customerName={customer.name} onErased={() => window.location.reload()} />
            </div>
          )}
        </section>

        <section aria-labelledby="plans-heading" className="space-y-3">
          <div className="flex flex-wrap items-center gap-2">
            <h2 id="plans-heading">Plans</h2>
            {canWrite && (
              <span className="ml-auto flex flex-wrap gap-2">
                <a className="btn-primary py-1.5" href={`/plan?customer=${customer.id}`}>
                  Plan on the map
                </a>
                <button type="button" className="btn-secondary py-1.5" onClick={newEnquiry} disabled={opening.pending}>
                  {opening.pending ? 'Opening…' : 'New enquiry'}
                </button>
              </span>
            )}
          </div>
          <p aria-live="polite" className="text-sm text-ink-600" data-testid="customer-notice">
            {notice}
          </p>
          {plans.length === 0 ? (
            <p className="card text-ink-500">No plans yet.</p>
          ) : (
            plans.map((p) => (
              <PlanCard
                key={p.id}
                plan={p}
                canWrite={canWrite}
                canRecord={canRecord}
                onChanged={(next) => {
                  update((d) => ({ ...d, plans: d.plans.map((x) => (x.id === next.id ? next : x)) }));
                  setNotice(`Plan ${next.id} is now ${PLAN_STATE_LABELS[next.state].toLowerCase()}`);
                }}
              />
            ))
          )}
        </section>
      </div>

      <CustomerHistory entries={history.data ?? []} />
    </div>
  );
}
