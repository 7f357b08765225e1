import { useState } from 'react';
import { checkWith } from '../../lib/client/api';
import { type AntennaBody, type CableBody, catalogueApi } from '../../lib/client/catalogue-api';
import type { AntennaJson, CableJson } from '../../lib/schemas/catalogue';
import { ANTENNA_KINDS, ANTENNA_KIND_LABELS, type AntennaKind } from '../../lib/domain/antenna-kinds';
import type { Column } from '../ui/SortableTable';
import { useQuery, useSubmit } from '../ui/use-api';
import { DeleteAction, Field, FormCard, InputField, ListCard, SelectField, SubmitButton, fieldAria, upsertById, withoutId, useNotice } from '../admin/parts';
import { bindChoice, bindText } from '../ui/bind-text';
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

export default function CatalogueAdmin() {
  const antennas = useQuery('antennas', () => catalogueApi.antennas().then((r) => r.items));
  const cables = useQuery('cables', () => catalogueApi.cables().then((r) => r.items));
  const saving = useSubmit({ failed: 'Could not save' });
  const { notice, setNotice, attempt } = useNotice();
  const [editing, setEditing] = useState<Editing>({ what: 'antenna', id: null });
  const [aForm, setAForm] = useState<AntennaForm>(NEW_ANTENNA);
  const [cForm, setCForm] = useState<CableForm>(NEW_CABLE);
  const fields = saving.fields;

  function start(next: Editing) {
    setEditing(next);
    saving.fail(null);
    if (next.what === 'antenna') setAForm(next.id ? antennaForm(antennas.data!.find((a) => a.id === next.id)!) : NEW_ANTENNA);
    else setCForm(next.id ? cableForm(cables.data!.find((c) => c.id === next.id)!) : NEW_CABLE);
    document.getElementById('catalogue-form')?.scrollIntoView({ behavior: 'smooth', block: 'start' });
  }

  async function save() {
    setNotice(null);
    // The rules load when first needed, so the page itself ships without the schema library.
    const { AntennaInputSchema, CableInputSchema } = await import('../../lib/schemas/catalogue');
    const { id } = editing;
    if (editing.what === 'antenna') {
      const body = antennaBody(aForm);
      const result = await saving.submit(() => (id ? catalogueApi.updateAntenna(id, body) : catalogueApi.createAntenna(body)), {
        check: () => checkWith(AntennaInputSchema, body),
      });
      if (!result.ok) return;
      antennas.setData((list) => upsertById(list, result.data));
      setNotice(`${id ? 'Saved' : 'Added'} antenna “${result.data.name}”`);
      setEditing({ what: 'antenna', id: result.data.id });
    } else {
      const body = cableBody(cForm);
      const result = await saving.submit(() => (id ? catalogueApi.updateCable(id, body) : catalogueApi.createCable(body)), {
        check: () => checkWith(CableInputSchema, body),
      });
      if (!result.ok) return;
      cables.setData((list) => upsertById(list, result.data));
      setNotice(`${id ? 'Saved' : 'Added'} cable “${result.data.name}”`);
      setEditing({ what: 'cable', id: result.data.id });
    }
  }

  const remove = (what: 'antenna' | 'cable', id: string, name: string) =>
    attempt(async () => {
      if (what === 'antenna') {
        await catalogueApi.deleteAntenna(id);
        antennas.setData((l) => withoutId(l, id));
      } else {
        await catalogueApi.deleteCable(id);
        cables.setData((l) => withoutId(l, id));
      }
      if (editing.id === id) start({ what, id: null });
      return `Deleted “${name}”`;
    }, 'Could not delete');

  const actions = (what: 'antenna' | 'cable', id: string, name: string) => (
    <DeleteAction name={name} onDelete={() => remove(what, id, name)}>
      <button type="button" className="btn-secondary py-1" onClick={() => start({ what, id } as Editing)}>
        Edit
      </button>
    </DeleteAction>
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

  const antennaText = bindText(aForm, setAForm, fields);
  const antennaChoice = bindChoice(aForm, setAForm, fields);
  const cableChoice = bindChoice(cForm, setCForm, fields);
  const cableText = bindText(cForm, setCForm, fields);
  const title = `${editing.id ? 'Edit' : 'New'} ${editing.what}`;
  const newButton = (what: 'antenna' | 'cable') => (
    <button type="button" className="btn-secondary ml-auto py-1" onClick={() => start({ what, id: null })}>
      New {what}
    </button>
  );

  return (
    <>
      <div aria-live="polite" className="mt-4 text-sm" data-testid="catalogue-notice">
        {notice && <p className="rounded-md border border-ink-200 bg-white px-3 py-2 text-ink-700">{notice}</p>}
      </div>
      <div className="mt-4 grid gap-6 lg:grid-cols-[1fr_24rem]">
        <div className="min-w-0 space-y-6">
          <ListCard id="antennas" title="Antennas" tools={newButton('antenna')} list={antennas} columns={antennaColumns} empty="No antennas yet" />
          <ListCard id="cables" title="Cables" tools={newButton('cable')} list={cables} columns={cableColumns} empty="No cables yet" />
        </div>

        <FormCard
          id="catalogue-form"
          className="self-start"
          title={title}
          onSubmit={save}
          sending={saving}
          submitLabel={editing.id ? 'Save changes' : `Add ${editing.what}`}
          actions={
            <div className="flex gap-2">
              <SubmitButton
                pending={saving.pending}
                label={saving.pending ? 'Saving…' : editing.id ? 'Save changes' : `Add ${editing.what}`}
                className="btn-primary flex-1"
              />
              {editing.id && (
                <button type="button" className="btn-secondary" onClick={() => start({ what: editing.what, id: null } as Editing)}>
                  Cancel
                </button>
              )}
            </div>
          }
        >
          {editing.what === 'antenna' ? (
            <>
              <InputField id="an-name" label="Name" {...antennaText('name')} />
              <div className="grid grid-cols-2 gap-3">
                <SelectField id="an-kind" label="Kind" options={ANTENNA_KINDS} labels={ANTENNA_KIND_LABELS} {...antennaChoice('kind')} />
                <InputField id="an-ports" label="Ports (MIMO)" inputMode="numeric" {...antennaText('ports')} />
              </div>
              <InputField
                id="an-beam"
                label="Horizontal beamwidth, °"
                inputMode="decimal"
                {...antennaText('beam', 'horizontal_beamwidth_deg')}
                value={aForm.kind === 'directional' ? aForm.beam : '360'}
                disabled={aForm.kind !== 'directional'}
                hint={aForm.kind === 'directional' ? 'Half-power (3 dB) beam; customer panels are commonly about 40°.' : 'Omni and stub antennas cover 360°.'}
              />
              <FrequencyTableEditor
                field="gain_table"
                valueKey="gain_dbi"
                valueLabel="Gain, dBi"
                valueStep="0.1"
                rows={aForm.rows}
                onChange={(rows) => setAForm({ ...aForm, rows })}
                errors={fields}
              />
              <NotesField id="an-notes" {...antennaChoice('notes')} />
            </>
          ) : (
            <>
              <InputField id="cb-name" label="Name" {...cableText('name')} />
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
                <InputField id="cb-conn" label="Connectors" inputMode="numeric" {...cableText('connectors')} />
                <InputField id="cb-closs" label="Loss per connector, dB" inputMode="decimal" {...cableText('connectorLoss', 'connector_loss_db')} />
              </div>
              <p className="text-xs text-ink-600">A mated pair below 3 GHz typically costs 0.1–0.2 dB; allow more for adapters and surge arresters.</p>
              <NotesField id="cb-notes" {...cableChoice('notes')} />
            </>
          )}
        </FormCard>
      </div>
    </>
  );
}

/** A record's free-text notes. */
function NotesField({ id, value, onChange, errors }: { id: string; value: string; onChange: (value: string) => void; errors?: string[] }) {
  return (
    <Field id={id} label="Notes" errors={errors}>
      <textarea rows={2} className="field-input" value={value} onChange={(e) => onChange(e.target.value)} {...fieldAria({ id, errors })} />
    </Field>
  );
}
