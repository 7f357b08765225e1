import { useEffect, useMemo, useState } from 'react';
import { operatorsApi } from '../../lib/client/operators-api';
import type { OperatorJson } from '../../lib/schemas/operators';
import { OPERATOR_PALETTE } from '../../lib/domain/operator-palette';
import type { Column } from '../ui/SortableTable';
import { bindText } from '../ui/bind-text';
import { useQuery, useSubmit } from '../ui/use-api';
import { FieldErrorText, FormCard, fieldAria, InputField, ListBesideForm, ListCard, upsertById, useNotice } from './parts';
import { mastIconDataUrl } from '../map/mast-icons';

const HEX = /^#[0-9a-fA-F]{6}$/;

/** Rough perceptual distance between two colours (weighted RGB), to warn about look-alikes. */
function colourDistance(a: string, b: string): number {
  const rgb = (h: string) => [1, 3, 5].map((i) => parseInt(h.slice(i, i + 2), 16));
  const [r1, g1, b1] = rgb(a);
  const [r2, g2, b2] = rgb(b);
  const rm = (r1 + r2) / 2;
  return Math.sqrt((2 + rm / 256) * (r1 - r2) ** 2 + 4 * (g1 - g2) ** 2 + (2 + (255 - rm) / 256) * (b1 - b2) ** 2);
}

function ColourEditor({ op, all, onSaved }: { op: OperatorJson; all: OperatorJson[]; onSaved: (o: OperatorJson) => void }) {
  const [draft, setDraft] = useState(op.colour);
  const saving = useSubmit({ failed: 'Could not save the colour' });
  useEffect(() => setDraft(op.colour), [op.colour]);
  const dirty = draft.toLowerCase() !== op.colour.toLowerCase();
  const inputId = `colour-${op.id}`;
  const errors = saving.error ? (saving.fields.colour ?? [saving.error.message]) : [];
  const lookalike = HEX.test(draft) ? all.find((o) => o.id !== op.id && colourDistance(o.colour, draft) < 60) : undefined;

  async function save() {
    const result = await saving.submit(() => operatorsApi.update(op.id, { colour: draft }));
    if (result.ok) onSaved(result.data);
  }

  return (
    <div>
      <div className="flex flex-wrap items-center gap-2">
        <input
          type="color"
          aria-label={`Colour of ${op.name}`}
          className="h-8 w-10 cursor-pointer rounded border border-ink-300 bg-white p-0.5"
          value={HEX.test(draft) ? draft.toLowerCase() : op.colour}
          onChange={(e) => setDraft(e.target.value)}
        />
        <label htmlFor={inputId} className="sr-only">
          Hex colour of {op.name}
        </label>
        <input
          className="field-input w-24 py-1 font-mono"
          value={draft}
          maxLength={7}
          onChange={(e) => setDraft(e.target.value.trim())}
          onKeyDown={(e) => e.key === 'Enter' && dirty && save()}
          {...fieldAria({ id: inputId, errors })}
          data-testid={`colour-input-${op.id}`}
        />
        {dirty && (
          <>
            <button type="button" className="btn-primary px-3 py-1" onClick={save} disabled={saving.pending}>
              Save
            </button>
            <button
              type="button"
              className="btn-secondary px-3 py-1"
              onClick={() => {
                setDraft(op.colour);
                saving.fail(null);
              }}
              disabled={saving.pending}
            >
              Undo
            </button>
          </>
        )}
      </div>
      <div className="mt-1 flex gap-1" role="group" aria-label={`Suggested colours for ${op.name}`}>
        {OPERATOR_PALETTE.map((c) => (
          <button
            key={c}
            type="button"
            title={c}
            aria-label={`Use ${c}`}
            className="h-4 w-4 rounded-sm border border-ink-200"
            style={{ background: c }}
            onClick={() => setDraft(c)}
          />
        ))}
      </div>
      <FieldErrorText id={inputId} errors={errors} />
      {!errors.length && lookalike && (
        <p className="mt-1 text-xs text-ember-700">
          Close to {lookalike.name}’s colour; the clock position still tells them apart, but a clearer colour helps.
        </p>
      )}
    </div>
  );
}

const EMPTY_FORM = { name: '', mcc: '001', mnc: '' };

export default function OperatorsAdmin() {
  const operators = useQuery('operators', () => operatorsApi.list().then((r) => r.items));
  const adding = useSubmit({ failed: 'Could not add the operator' });
  const { notice, setNotice } = useNotice();
  const [form, setForm] = useState(EMPTY_FORM);
  const field = bindText(form, setForm, adding.fields);
  const list = operators.data;

  const marks = useMemo(() => (list ?? []).map((o) => ({ id: o.id, name: o.name, colour: o.colour })), [list]);
  const preview = useMemo(
    () =>
      marks.length
        ? mastIconDataUrl(
            'active',
            marks.map((m) => m.id),
            marks,
          )
        : null,
    [marks],
  );

  const replace = (o: OperatorJson) => {
    operators.setData((l) => upsertById(l, o));
    setNotice(`${o.name}: colour set to ${o.colour}`);
  };

  async function create() {
    const result = await adding.submit(() => operatorsApi.create(form));
    if (!result.ok) return;
    operators.setData((l) => upsertById(l, result.data));
    setForm(EMPTY_FORM);
    setNotice(`Added ${result.data.name} (${result.data.plmn})`);
  }

  const columns: Column<OperatorJson>[] = [
    {
      key: 'name',
      label: 'Operator',
      sortValue: (o) => o.name.toLowerCase(),
      render: (o) => (
        <span className="inline-flex items-center gap-2 font-semibold">
          <img src={mastIconDataUrl('active', [o.id], marks)} alt="" width={26} height={26} />
          {o.name}
        </span>
      ),
    },
    {
      key: 'plmn',
      label: 'MCC / MNC',
      sortValue: (o) => o.plmn,
      render: (o) => (
        <span className="font-mono">
          {o.mcc} / {o.mnc}
        </span>
      ),
    },
    { key: 'cells', label: 'Cells', sortValue: (o) => o.cell_count, render: (o) => o.cell_count, className: 'text-right' },
    { key: 'colour', label: 'Map colour', render: (o) => <ColourEditor op={o} all={list ?? []} onSaved={replace} /> },
  ];

  return (
    <ListBesideForm>
      <ListCard
        id="operators"
        title="Operators"
        tools={
          preview && (
            <span className="ml-auto inline-flex items-center gap-2 text-sm text-ink-600">
              A mast with all of them: <img src={preview} alt="" width={34} height={34} />
            </span>
          )
        }
        notice={notice}
        list={operators}
        columns={columns}
        initialSort={{ key: 'plmn', dir: 'asc' }}
        empty="No operators yet"
      />
      <FormCard
        id="new-operator"
        title="New operator"
        intro="It takes the first unused colour of the colour-blind-safe palette; change it afterwards if you like."
        onSubmit={create}
        sending={adding}
        submitLabel="Add operator"
      >
        <InputField id="op-name" label="Name" {...field('name')} />
        <div className="grid grid-cols-2 gap-3">
          <InputField id="op-mcc" label="MCC" inputMode="numeric" className="font-mono" {...field('mcc')} />
          <InputField id="op-mnc" label="MNC" inputMode="numeric" className="font-mono" {...field('mnc')} />
        </div>
      </FormCard>
    </ListBesideForm>
  );
}
