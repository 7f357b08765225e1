import { useEffect, useState, type FormEvent, type ReactNode } from 'react';
import { ApiError, checkWith, type FieldErrors } from '../../lib/client/api';
import { catalogueApi } from '../../lib/client/catalogue-api';
import { operatorsApi } from '../../lib/client/operators-api';
import type { AntennaJson } from '../../lib/schemas/catalogue';
import type { CustomerBody } from '../../lib/client/customers-api';
import type { CustomerJson } from '../../lib/schemas/customers';
import type { OperatorJson } from '../../lib/schemas/operators';
import AddressSearch from '../planner/AddressSearch';

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

function Field({ id, label, error, children }: { id: string; label: string; error?: string[]; children: ReactNode }) {
  return (
    <div>
      <label htmlFor={id} className="field-label">
        {label}
      </label>
      {children}
      {error?.map((m) => (
        <p key={m} className="field-error" id={`${id}-error`}>
          {m}
        </p>
      ))}
    </div>
  );
}

/** Customer details; the address comes from the gazetteer (or typed coordinates) and stays editable. */
export default function CustomerForm({ customer, submitLabel, onSave, onCancel }: Props) {
  const [form, setForm] = useState<Form>(() => fromCustomer(customer));
  const [operators, setOperators] = useState<OperatorJson[]>([]);
  const [antennas, setAntennas] = useState<AntennaJson[]>([]);
  const [fields, setFields] = useState<FieldErrors>({});
  const [formError, setFormError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const idp = customer ? `cu-${customer.id}` : 'cu-new';

  useEffect(() => {
    operatorsApi.list().then(
      (r) => setOperators(r.items),
      () => setOperators([]),
    );
    catalogueApi.antennas().then(
      (r) => setAntennas(r.items),
      () => setAntennas([]),
    );
  }, []);

  const set = (patch: Partial<Form>) => setForm((f) => ({ ...f, ...patch }));

  async function submit(e: FormEvent) {
    e.preventDefault();
    setFormError(null);
    const body = toBody(form);
    // The rules load when first needed, so the page itself ships without the schema library.
    const { CustomerInputSchema } = await import('../../lib/schemas/customers');
    const problems = checkWith(CustomerInputSchema, body);
    setFields(problems ?? {});
    if (problems) {
      setFormError('Some fields need attention');
      return;
    }
    setBusy(true);
    try {
      await onSave(body);
    } catch (err) {
      if (err instanceof ApiError) {
        setFields(err.fields);
        setFormError(err.message);
      } else setFormError('Could not save the customer');
    } finally {
      setBusy(false);
    }
  }

  const err = (k: string) => fields[k];
  return (
    <form className="space-y-3" onSubmit={submit} noValidate data-testid="customer-form">
      {formError && (
        <p role="alert" className="text-sm text-alarm-700">
          {formError}
        </p>
      )}
      <Field id={`${idp}-name`} label="Name" error={err('name')}>
        <input id={`${idp}-name`} className="field-input" value={form.name} onChange={(e) => set({ name: e.target.value })} aria-invalid={!!err('name')} />
      </Field>
      <div className="grid gap-3 sm:grid-cols-2">
        <Field id={`${idp}-phone`} label="Phone" error={err('phone')}>
          <input
            id={`${idp}-phone`}
            type="tel"
            className="field-input"
            value={form.phone}
            onChange={(e) => set({ phone: e.target.value })}
            aria-invalid={!!err('phone')}
          />
        </Field>
        <Field id={`${idp}-email`} label="E-mail" error={err('email')}>
          <input
            id={`${idp}-email`}
            type="email"
            className="field-input"
            value={form.email}
            onChange={(e) => set({ email: e.target.value })}
            aria-invalid={!!err('email')}
          />
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
        <Field id={`${idp}-label`} label="Address" error={err('address_label')}>
          <input
            id={`${idp}-label`}
            className="field-input"
            value={form.address_label}
            onChange={(e) => set({ address_label: e.target.value })}
            aria-invalid={!!err('address_label')}
          />
        </Field>
        <div className="grid grid-cols-3 gap-2">
          <Field id={`${idp}-postcode`} label="Postcode" error={err('postcode')}>
            <input
              id={`${idp}-postcode`}
              className="field-input"
              value={form.postcode}
              onChange={(e) => set({ postcode: e.target.value })}
              aria-invalid={!!err('postcode')}
            />
          </Field>
          <Field id={`${idp}-lat`} label="Latitude" error={err('lat')}>
            <input
              id={`${idp}-lat`}
              inputMode="decimal"
              className="field-input"
              value={form.lat}
              onChange={(e) => set({ lat: e.target.value })}
              aria-invalid={!!err('lat')}
            />
          </Field>
          <Field id={`${idp}-lon`} label="Longitude" error={err('lon')}>
            <input
              id={`${idp}-lon`}
              inputMode="decimal"
              className="field-input"
              value={form.lon}
              onChange={(e) => set({ lon: e.target.value })}
              aria-invalid={!!err('lon')}
            />
          </Field>
        </div>
      </fieldset>
      <div className="grid gap-3 sm:grid-cols-2">
        <Field id={`${idp}-operator`} label="Current operator" error={err('current_operator_id')}>
          <select
            id={`${idp}-operator`}
            className="field-input"
            value={form.current_operator_id}
            onChange={(e) => set({ current_operator_id: e.target.value })}
          >
            <option value="">Not known</option>
            {operators.map((o) => (
              <option key={o.id} value={o.id}>
                {o.name}
              </option>
            ))}
          </select>
        </Field>
        <Field id={`${idp}-antenna`} label="Current antenna" error={err('current_antenna_id')}>
          <select id={`${idp}-antenna`} className="field-input" value={form.current_antenna_id} onChange={(e) => set({ current_antenna_id: e.target.value })}>
            <option value="">Not known</option>
            {antennas.map((a) => (
              <option key={a.id} value={a.id}>
                {a.name}
              </option>
            ))}
          </select>
        </Field>
      </div>
      <Field id={`${idp}-notes`} label="Notes" error={err('notes')}>
        <textarea
          id={`${idp}-notes`}
          rows={3}
          className="field-input"
          value={form.notes}
          onChange={(e) => set({ notes: e.target.value })}
          placeholder="Access, ladders, dogs, best times to visit"
        />
      </Field>
      <div className="flex gap-2">
        <button type="submit" className="btn-primary flex-1" disabled={busy}>
          {busy ? 'Saving…' : submitLabel}
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
