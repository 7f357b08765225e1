import { useState, type FormEvent } from 'react';
import { checkWith } from '../../lib/client/api';
import { catalogueApi } from '../../lib/client/catalogue-api';
import { operatorsApi } from '../../lib/client/operators-api';
import type { CustomerBody } from '../../lib/client/customers-api';
import type { CustomerJson } from '../../lib/schemas/customers';
import AddressSearch from '../planner/AddressSearch';
import { OperatorOptions } from '../map/form-parts';
import { Field, fieldAria } from '../ui/field';
import { useQuery, useSubmit } from '../ui/use-api';

interface Props {
  /** Editing an existing customer, or null for a new one. */
  customer: CustomerJson | null;
  submitLabel: string;
  onSave: (body: CustomerBody) => Promise<void>;
  onCancel?: () => void;
}

interface Form {
  name: string;
  phone: string;
  email: string;
  address_label: string;
  postcode: string;
  lat: string;
  lon: string;
  current_operator_id: string;
  current_antenna_id: string;
  notes: string;
}

const fromCustomer = (c: CustomerJson | null): Form => ({
  name: c?.name ?? '',
  phone: c?.phone ?? '',
  email: c?.email ?? '',
  address_label: c?.address_label ?? '',
  postcode: c?.postcode ?? '',
  lat: c ? String(c.lat) : '',
  lon: c ? String(c.lon) : '',
  current_operator_id: c?.current_operator_id ?? '',
  current_antenna_id: c?.current_antenna_id ?? '',
  notes: c?.notes ?? '',
});

const num = (s: string) => (s.trim() === '' ? undefined : Number(s.trim()));

function toBody(f: Form): CustomerBody {
  return {
    name: f.name,
    phone: f.phone || null,
    email: f.email || null,
    address_label: f.address_label,
    postcode: f.postcode || null,
    lat: num(f.lat) as number,
    lon: num(f.lon) as number,
    current_operator_id: f.current_operator_id || null,
    current_antenna_id: f.current_antenna_id || null,
    notes: f.notes || null,
  };
}

/** Customer details; the address comes from the gazetteer (or typed coordinates) and stays editable. */
export default function CustomerForm({ customer, submitLabel, onSave, onCancel }: Props) {
  const [form, setForm] = useState<Form>(() => fromCustomer(customer));
  // Without the lists the choices stay at "Not known"; the rest of the form still works.
  const operators = useQuery('operators', () => operatorsApi.list().then((r) => r.items));
  const antennas = useQuery('antennas', () => catalogueApi.antennas().then((r) => r.items));
  const saving = useSubmit({ failed: 'Could not save the customer' });
  const idp = customer ? `cu-${customer.id}` : 'cu-new';

  const set = (patch: Partial<Form>) => setForm((f) => ({ ...f, ...patch }));
  /** The field of body key `key`: its id, label and errors, for `Field` and (with `fieldAria`) its control. */
  const frame = (key: keyof Form, label: string, idSuffix: string = key) => ({ id: `${idp}-${idSuffix}`, label, errors: saving.fields[key] });

  async function submit(e: FormEvent) {
    e.preventDefault();
    const body = toBody(form);
    // The rules load when first needed, so the page itself ships without the schema library.
    const { CustomerInputSchema } = await import('../../lib/schemas/customers');
    await saving.submit(() => onSave(body), { check: () => checkWith(CustomerInputSchema, body) });
  }

  const name = frame('name', 'Name');
  const phone = frame('phone', 'Phone');
  const email = frame('email', 'E-mail');
  const address = frame('address_label', 'Address', 'label');
  const postcode = frame('postcode', 'Postcode');
  const lat = frame('lat', 'Latitude');
  const lon = frame('lon', 'Longitude');
  const operator = frame('current_operator_id', 'Current operator', 'operator');
  const antenna = frame('current_antenna_id', 'Current antenna', 'antenna');
  const notes = frame('notes', 'Notes');
  return (
    <form className="space-y-3" onSubmit={submit} noValidate data-testid="customer-form">
      {saving.error && (
        <p role="alert" className="text-sm text-alarm-700">
          {saving.error.message}
        </p>
      )}
      <Field {...name}>
        <input className="field-input" value={form.name} onChange={(e) => set({ name: e.target.value })} {...fieldAria(name)} />
      </Field>
      <div className="grid gap-3 sm:grid-cols-2">
        <Field {...phone}>
          <input type="tel" className="field-input" value={form.phone} onChange={(e) => set({ phone: e.target.value })} {...fieldAria(phone)} />
        </Field>
        <Field {...email}>
          <input type="email" className="field-input" value={form.email} onChange={(e) => set({ email: e.target.value })} {...fieldAria(email)} />
        </Field>
      </div>
      <fieldset className="space-y-3 rounded-md border border-ink-200 p-3">
        <legend className="px-1 text-sm font-semibold text-ink-800">Where the antenna goes</legend>
        <AddressSearch
          onPick={(m) =>
            set({
              address_label: m.kind === 'coordinates' && form.address_label ? form.address_label : m.label,
              postcode: m.postcode ?? (m.kind === 'coordinates' ? form.postcode : ''),
              lat: String(m.lat),
              lon: String(m.lon),
            })
          }
        />
        <Field {...address}>
          <input className="field-input" value={form.address_label} onChange={(e) => set({ address_label: e.target.value })} {...fieldAria(address)} />
        </Field>
        <div className="grid grid-cols-3 gap-2">
          <Field {...postcode}>
            <input className="field-input" value={form.postcode} onChange={(e) => set({ postcode: e.target.value })} {...fieldAria(postcode)} />
          </Field>
          <Field {...lat}>
            <input inputMode="decimal" className="field-input" value={form.lat} onChange={(e) => set({ lat: e.target.value })} {...fieldAria(lat)} />
          </Field>
          <Field {...lon}>
            <input inputMode="decimal" className="field-input" value={form.lon} onChange={(e) => set({ lon: e.target.value })} {...fieldAria(lon)} />
          </Field>
        </div>
      </fieldset>
      <div className="grid gap-3 sm:grid-cols-2">
        <Field {...operator}>
          <select
            className="field-input"
            value={form.current_operator_id}
            onChange={(e) => set({ current_operator_id: e.target.value })}
            {...fieldAria(operator)}
          >
            <option value="">Not known</option>
            <OperatorOptions operators={operators.data ?? []} />
          </select>
        </Field>
        <Field {...antenna}>
          <select className="field-input" value={form.current_antenna_id} onChange={(e) => set({ current_antenna_id: e.target.value })} {...fieldAria(antenna)}>
            <option value="">Not known</option>
            {(antennas.data ?? []).map((a) => (
              <option key={a.id} value={a.id}>
                {a.name}
              </option>
            ))}
          </select>
        </Field>
      </div>
      <Field {...notes}>
        <textarea
          rows={3}
          className="field-input"
          value={form.notes}
          onChange={(e) => set({ notes: e.target.value })}
          placeholder="Access, ladders, dogs, best times to visit"
          {...fieldAria(notes)}
        />
      </Field>
      <div className="flex gap-2">
        <button type="submit" className="btn-primary flex-1" disabled={saving.pending}>
          {saving.pending ? 'Saving…' : submitLabel}
        </button>
        {onCancel && (
          <button type="button" className="btn-secondary" onClick={onCancel}>
            Cancel
          </button>
        )}
      </div>
    </form>
  );
}
