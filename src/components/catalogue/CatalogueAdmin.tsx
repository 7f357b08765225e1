import { useEffect, useState, type FormEvent, type ReactNode } from 'react';
import { ApiError, type FieldErrors } from '../../lib/client/api';
import { catalogueApi, checkWith, type AntennaBody, type AntennaJson, type CableBody, type CableJson } from '../../lib/client/planning-api';
import { ANTENNA_KINDS, ANTENNA_KIND_LABELS, type AntennaKind } from '../../lib/domain/antenna-kinds';
import { SortableTable, type Column } from '../ui/SortableTable';
import { FrequencyTableEditor, toNumber, type FrequencyRow } from './FrequencyTableEditor';
import { formatNumber } from '../../lib/domain/format';

type Editing = { what: 'antenna'; id: string | null } | { what: 'cable'; id: string | null };

interface AntennaForm {
  name: string;
  kind: AntennaKind;
  ports: string;
  beam: string;
  rows: FrequencyRow[];
  notes: string;
}
interface CableForm {
  name: string;
  rows: FrequencyRow[];
  connectorLoss: string;
  connectors: string;
  notes: string;
}

const NEW_ANTENNA: AntennaForm = {
  name: '',
  kind: 'directional',
  ports: '2',
  beam: '40',
  rows: [
    { freq: '700', value: '' },
    { freq: '2700', value: '' },
  ],
  notes: '',
};
const NEW_CABLE: CableForm = {
  name: '',
  rows: [
    { freq: '800', value: '' },
    { freq: '2600', value: '' },
  ],
  connectorLoss: '0.15',
  connectors: '2',
  notes: '',
};

const antennaForm = (a: AntennaJson): AntennaForm => ({
  name: a.name,
  kind: a.kind,
  ports: String(a.ports),
  beam: String(a.horizontal_beamwidth_deg),
  rows: a.gain_table.map((r) => ({ freq: String(r.freq_mhz), value: String(r.gain_dbi) })),
  notes: a.notes ?? '',
});
const cableForm = (c: CableJson): CableForm => ({
  name: c.name,
  rows: c.loss_table.map((r) => ({ freq: String(r.freq_mhz), value: String(r.loss_db_per_m) })),
  connectorLoss: String(c.connector_loss_db),
  connectors: String(c.connectors),
  notes: c.notes ?? '',
});

function antennaBody(f: AntennaForm): AntennaBody {
  return {
    name: f.name,
    kind: f.kind,
    ports: toNumber(f.ports) as number,
    horizontal_beamwidth_deg: f.kind === 'directional' ? toNumber(f.beam) : 360,
    gain_table: f.rows.map((r) => ({ freq_mhz: toNumber(r.freq) as number, gain_dbi: toNumber(r.value) as number })),
    notes: f.notes,
  };
}
function cableBody(f: CableForm): CableBody {
  return {
    name: f.name,
    loss_table: f.rows.map((r) => ({ freq_mhz: toNumber(r.freq) as number, loss_db_per_m: toNumber(r.value) as number })),
    connector_loss_db: toNumber(f.connectorLoss) as number,
    connectors: toNumber(f.connectors) as number,
    notes: f.notes,
  };
}

const span = (values: number[], unit: string, digits = 1) => {
  const lo = Math.min(...values);
  const hi = Math.max(...values);
  return lo === hi ? `${formatNumber(lo, digits)} ${unit}` : `${formatNumber(lo, digits)}–${formatNumber(hi, digits)} ${unit}`;
};
const band = (rows: { freq_mhz: number }[]) =>
  span(
    rows.map((r) => r.freq_mhz),
    'MHz',
    0,
  );

function Field({ id, label, error, children, hint }: { id: string; label: string; error?: string[]; children: ReactNode; hint?: string }) {
  return (
    <div>
      <label htmlFor={id} className="field-label">
        {label}
      </label>
      {children}
      {hint && <p className="mt-1 text-xs text-ink-600">{hint}</p>}
      {error?.map((m) => (
        <p key={m} className="field-error" id={`${id}-error`}>
          {m}
        </p>
      ))}
    </div>
  );
}

export default function CatalogueAdmin() {
  const [antennas, setAntennas] = useState<AntennaJson[] | null>(null);
  const [cables, setCables] = useState<CableJson[] | null>(null);
  const [loadError, setLoadError] = useState<string | null>(null);
  const [editing, setEditing] = useState<Editing>({ what: 'antenna', id: null });
  const [aForm, setAForm] = useState<AntennaForm>(NEW_ANTENNA);
  const [cForm, setCForm] = useState<CableForm>(NEW_CABLE);
  const [fields, setFields] = useState<FieldErrors>({});
  const [formError, setFormError] = useState<string | null>(null);
  const [notice, setNotice] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  useEffect(() => {
    Promise.all([catalogueApi.antennas(), catalogueApi.cables()]).then(
      ([a, c]) => {
        setAntennas(a.items);
        setCables(c.items);
      },
      (e: ApiError) => setLoadError(e.message),
    );
  }, []);

  function start(next: Editing) {
    setEditing(next);
    setFields({});
    setFormError(null);
    if (next.what === 'antenna') setAForm(next.id ? antennaForm(antennas!.find((a) => a.id === next.id)!) : NEW_ANTENNA);
    else setCForm(next.id ? cableForm(cables!.find((c) => c.id === next.id)!) : NEW_CABLE);
    document.getElementById('catalogue-form')?.scrollIntoView({ behavior: 'smooth', block: 'start' });
  }

  async function save(e: FormEvent) {
    e.preventDefault();
    setFormError(null);
    setNotice(null);
    const body = editing.what === 'antenna' ? antennaBody(aForm) : cableBody(cForm);
    // The rules load when first needed, so the page itself ships without the schema library.
    const { AntennaInputSchema, CableInputSchema } = await import('../../lib/schemas/catalogue');
    const problems = checkWith(editing.what === 'antenna' ? AntennaInputSchema : CableInputSchema, body);
    setFields(problems ?? {});
    if (problems) {
      setFormError('Some fields need attention');
      return;
    }
    setBusy(true);
    try {
      if (editing.what === 'antenna') {
        const b = body as AntennaBody;
        const saved = editing.id ? await catalogueApi.updateAntenna(editing.id, b) : await catalogueApi.createAntenna(b);
        setAntennas((list) => (editing.id ? (list ?? []).map((x) => (x.id === saved.id ? saved : x)) : [...(list ?? []), saved]));
        setNotice(`${editing.id ? 'Saved' : 'Added'} antenna “${saved.name}”`);
        setEditing({ what: 'antenna', id: saved.id });
      } else {
        const b = body as CableBody;
        const saved = editing.id ? await catalogueApi.updateCable(editing.id, b) : await catalogueApi.createCable(b);
        setCables((list) => (editing.id ? (list ?? []).map((x) => (x.id === saved.id ? saved : x)) : [...(list ?? []), saved]));
        setNotice(`${editing.id ? 'Saved' : 'Added'} cable “${saved.name}”`);
        setEditing({ what: 'cable', id: saved.id });
      }
      setFields({});
    } catch (err) {
      if (err instanceof ApiError) {
        setFields(err.fields);
        setFormError(err.message);
      } else setFormError('Could not save');
    } finally {
      setBusy(false);
    }
  }

  async function remove(what: 'antenna' | 'cable', id: string, name: string) {
    if (!window.confirm(`Delete “${name}” from the catalogue?`)) return;
    setNotice(null);
    try {
      if (what === 'antenna') {
        await catalogueApi.deleteAntenna(id);
        setAntennas((l) => (l ?? []).filter((x) => x.id !== id));
      } else {
        await catalogueApi.deleteCable(id);
        setCables((l) => (l ?? []).filter((x) => x.id !== id));
      }
      if (editing.id === id) start({ what, id: null });
      setNotice(`Deleted “${name}”`);
    } catch (err) {
      setNotice(err instanceof ApiError ? err.message : 'Could not delete');
    }
  }

  const actions = (what: 'antenna' | 'cable', id: string, name: string) => (
    <div className="flex gap-2">
      <button type="button" className="btn-secondary py-1" onClick={() => start({ what, id } as Editing)}>
        Edit
      </button>
      <button type="button" className="btn-secondary py-1 text-alarm-700" onClick={() => remove(what, id, name)}>
        Delete
      </button>
    </div>
  );

  const antennaColumns: Column<AntennaJson>[] = [
    { key: 'name', label: 'Name', sortValue: (a) => a.name.toLowerCase(), render: (a) => <span className="font-semibold">{a.name}</span> },
    { key: 'kind', label: 'Kind', sortValue: (a) => a.kind, render: (a) => ANTENNA_KIND_LABELS[a.kind] },
    { key: 'ports', label: 'Ports', sortValue: (a) => a.ports, render: (a) => a.ports },
    { key: 'beam', label: 'Beam', sortValue: (a) => a.horizontal_beamwidth_deg, render: (a) => `${a.horizontal_beamwidth_deg}°` },
    {
      key: 'gain',
      label: 'Gain',
      sortValue: (a) => Math.max(...a.gain_table.map((r) => r.gain_dbi)),
      render: (a) =>
        span(
          a.gain_table.map((r) => r.gain_dbi),
          'dBi',
        ),
    },
    { key: 'band', label: 'Band', render: (a) => band(a.gain_table) },
    { key: 'actions', label: 'Actions', render: (a) => actions('antenna', a.id, a.name) },
  ];
  const cableColumns: Column<CableJson>[] = [
    { key: 'name', label: 'Name', sortValue: (c) => c.name.toLowerCase(), render: (c) => <span className="font-semibold">{c.name}</span> },
    {
      key: 'loss',
      label: 'Loss',
      sortValue: (c) => Math.max(...c.loss_table.map((r) => r.loss_db_per_m)),
      render: (c) =>
        span(
          c.loss_table.map((r) => r.loss_db_per_m),
          'dB/m',
          2,
        ),
    },
    { key: 'band', label: 'Band', render: (c) => band(c.loss_table) },
    { key: 'connectors', label: 'Connectors', sortValue: (c) => c.connectors, render: (c) => `${c.connectors} × ${c.connector_loss_db} dB` },
    { key: 'actions', label: 'Actions', render: (c) => actions('cable', c.id, c.name) },
  ];

  const err = (k: string) => fields[k];
  const title = `${editing.id ? 'Edit' : 'New'} ${editing.what}`;

  if (loadError)
    return (
      <p role="alert" className="mt-6 text-alarm-700">
        {loadError}
      </p>
    );
  if (!antennas || !cables) return <p className="mt-6 text-ink-500">Loading the catalogue…</p>;

  return (
    <>
      <div aria-live="polite" className="mt-4 text-sm" data-testid="catalogue-notice">
        {notice && <p className="rounded-md border border-ink-200 bg-white px-3 py-2 text-ink-700">{notice}</p>}
      </div>
      <div className="mt-4 grid gap-6 lg:grid-cols-[1fr_24rem]">
        <div className="min-w-0 space-y-6">
          <section className="card min-w-0" aria-labelledby="antennas-heading">
            <div className="mb-3 flex flex-wrap items-center gap-3">
              <h2 id="antennas-heading">Antennas</h2>
              <button type="button" className="btn-secondary ml-auto py-1" onClick={() => start({ what: 'antenna', id: null })}>
                New antenna
              </button>
            </div>
            <SortableTable
              rows={antennas}
              columns={antennaColumns}
              rowKey={(a) => a.id}
              initialSort={{ key: 'name', dir: 'asc' }}
              empty="No antennas yet"
              caption="Antennas"
            />
          </section>
          <section className="card min-w-0" aria-labelledby="cables-heading">
            <div className="mb-3 flex flex-wrap items-center gap-3">
              <h2 id="cables-heading">Cables</h2>
              <button type="button" className="btn-secondary ml-auto py-1" onClick={() => start({ what: 'cable', id: null })}>
                New cable
              </button>
            </div>
            <SortableTable
              rows={cables}
              columns={cableColumns}
              rowKey={(c) => c.id}
              initialSort={{ key: 'name', dir: 'asc' }}
              empty="No cables yet"
              caption="Cables"
            />
          </section>
        </div>

        <section id="catalogue-form" className="card min-w-0 self-start" aria-labelledby="catalogue-form-heading">
          <h2 id="catalogue-form-heading">{title}</h2>
          <form className="mt-3 space-y-3" onSubmit={save} noValidate>
            {formError && (
              <p role="alert" className="text-sm text-alarm-700">
                {formError}
              </p>
            )}
            {editing.what === 'antenna' ? (
              <>
                <Field id="an-name" label="Name" error={err('name')}>
                  <input
                    id="an-name"
                    className="field-input"
                    value={aForm.name}
                    onChange={(e) => setAForm({ ...aForm, name: e.target.value })}
                    aria-invalid={!!err('name')}
                  />
                </Field>
                <div className="grid grid-cols-2 gap-3">
                  <Field id="an-kind" label="Kind" error={err('kind')}>
                    <select
                      id="an-kind"
                      className="field-input"
                      value={aForm.kind}
                      onChange={(e) => setAForm({ ...aForm, kind: e.target.value as AntennaKind })}
                    >
                      {ANTENNA_KINDS.map((k) => (
                        <option key={k} value={k}>
                          {ANTENNA_KIND_LABELS[k]}
                        </option>
                      ))}
                    </select>
                  </Field>
                  <Field id="an-ports" label="Ports (MIMO)" error={err('ports')}>
                    <input
                      id="an-ports"
                      inputMode="numeric"
                      className="field-input"
                      value={aForm.ports}
                      onChange={(e) => setAForm({ ...aForm, ports: e.target.value })}
                      aria-invalid={!!err('ports')}
                    />
                  </Field>
                </div>
                <Field
                  id="an-beam"
                  label="Horizontal beamwidth, °"
                  error={err('horizontal_beamwidth_deg')}
                  hint={aForm.kind === 'directional' ? 'Half-power (3 dB) beam; customer panels are commonly about 40°.' : 'Omni and stub antennas cover 360°.'}
                >
                  <input
                    id="an-beam"
                    inputMode="decimal"
                    className="field-input"
                    value={aForm.kind === 'directional' ? aForm.beam : '360'}
                    disabled={aForm.kind !== 'directional'}
                    onChange={(e) => setAForm({ ...aForm, beam: e.target.value })}
                    aria-invalid={!!err('horizontal_beamwidth_deg')}
                  />
                </Field>
                <FrequencyTableEditor
                  field="gain_table"
                  valueKey="gain_dbi"
                  valueLabel="Gain, dBi"
                  valueStep="0.1"
                  rows={aForm.rows}
                  onChange={(rows) => setAForm({ ...aForm, rows })}
                  errors={fields}
                />
                <Field id="an-notes" label="Notes" error={err('notes')}>
                  <textarea
                    id="an-notes"
                    rows={2}
                    className="field-input"
                    value={aForm.notes}
                    onChange={(e) => setAForm({ ...aForm, notes: e.target.value })}
                  />
                </Field>
              </>
            ) : (
              <>
                <Field id="cb-name" label="Name" error={err('name')}>
                  <input
                    id="cb-name"
                    className="field-input"
                    value={cForm.name}
                    onChange={(e) => setCForm({ ...cForm, name: e.target.value })}
                    aria-invalid={!!err('name')}
                  />
                </Field>
                <FrequencyTableEditor
                  field="loss_table"
                  valueKey="loss_db_per_m"
                  valueLabel="Loss, dB/m"
                  valueStep="0.01"
                  rows={cForm.rows}
                  onChange={(rows) => setCForm({ ...cForm, rows })}
                  errors={fields}
                />
                <div className="grid grid-cols-2 gap-3">
                  <Field id="cb-conn" label="Connectors" error={err('connectors')}>
                    <input
                      id="cb-conn"
                      inputMode="numeric"
                      className="field-input"
                      value={cForm.connectors}
                      onChange={(e) => setCForm({ ...cForm, connectors: e.target.value })}
                      aria-invalid={!!err('connectors')}
                    />
                  </Field>
                  <Field id="cb-closs" label="Loss per connector, dB" error={err('connector_loss_db')}>
                    <input
                      id="cb-closs"
                      inputMode="decimal"
                      className="field-input"
                      value={cForm.connectorLoss}
                      onChange={(e) => setCForm({ ...cForm, connectorLoss: e.target.value })}
                      aria-invalid={!!err('connector_loss_db')}
                    />
                  </Field>
                </div>
                <p className="text-xs text-ink-600">A mated pair below 3 GHz typically costs 0.1–0.2 dB; allow more for adapters and surge arresters.</p>
                <Field id="cb-notes" label="Notes" error={err('notes')}>
                  <textarea
                    id="cb-notes"
                    rows={2}
                    className="field-input"
                    value={cForm.notes}
                    onChange={(e) => setCForm({ ...cForm, notes: e.target.value })}
                  />
                </Field>
              </>
            )}
            <div className="flex gap-2">
              <button type="submit" className="btn-primary flex-1" disabled={busy}>
                {busy ? 'Saving…' : editing.id ? 'Save changes' : `Add ${editing.what}`}
              </button>
              {editing.id && (
                <button type="button" className="btn-secondary" onClick={() => start({ what: editing.what, id: null } as Editing)}>
                  Cancel
                </button>
              )}
            </div>
          </form>
        </section>
      </div>
    </>
  );
}
