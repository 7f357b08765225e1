import { useEffect, useMemo, useState, type FormEvent } from 'react';
import { ApiError, operatorsApi, type FieldErrors, type OperatorJson } from '../../lib/client/api';
import { OPERATOR_PALETTE } from '../../lib/domain/operator-palette';
import { SortableTable, type Column } from '../ui/SortableTable';
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
  const [errors, setErrors] = useState<string[]>([]);
  const [busy, setBusy] = useState(false);
  useEffect(() => setDraft(op.colour), [op.colour]);
  const dirty = draft.toLowerCase() !== op.colour.toLowerCase();
  const inputId = `colour-${op.id}`;
  const errId = `colour-${op.id}-error`;
  const lookalike = HEX.test(draft) ? all.find((o) => o.id !== op.id && colourDistance(o.colour, draft) < 60) : undefined;

  async function save() {
    setBusy(true);
    setErrors([]);
    try {
      onSaved(await operatorsApi.update(op.id, { colour: draft }));
    } catch (e) {
      setErrors(e instanceof ApiError ? (e.fields.colour ?? [e.message]) : ['Could not save the colour']);
    } finally {
      setBusy(false);
    }
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
          id={inputId}
          className="field-input w-24 py-1 font-mono"
          value={draft}
          maxLength={7}
          onChange={(e) => setDraft(e.target.value.trim())}
          onKeyDown={(e) => e.key === 'Enter' && dirty && save()}
          aria-invalid={errors.length > 0}
          aria-describedby={errors.length ? errId : undefined}
          data-testid={`colour-input-${op.id}`}
        />
        {dirty && (
          <>
            <button type="button" className="btn-primary px-3 py-1" onClick={save} disabled={busy}>
              Save
            </button>
            <button
              type="button"
              className="btn-secondary px-3 py-1"
              onClick={() => {
                setDraft(op.colour);
                setErrors([]);
              }}
              disabled={busy}
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
      {errors.map((m) => (
        <p key={m} id={errId} className="field-error">
          {m}
        </p>
      ))}
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
  const [operators, setOperators] = useState<OperatorJson[] | null>(null);
  const [loadError, setLoadError] = useState<string | null>(null);
  const [notice, setNotice] = useState<string | null>(null);
  const [form, setForm] = useState(EMPTY_FORM);
  const [fieldErrors, setFieldErrors] = useState<FieldErrors>({});
  const [formError, setFormError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  useEffect(() => {
    operatorsApi.list().then(
      (r) => setOperators(r.items),
      (e: ApiError) => setLoadError(e.message),
    );
  }, []);

  const marks = useMemo(() => (operators ?? []).map((o) => ({ id: o.id, name: o.name, colour: o.colour })), [operators]);
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
    setOperators((list) => (list ?? []).map((x) => (x.id === o.id ? o : x)));
    setNotice(`${o.name}: colour set to ${o.colour}`);
  };

  async function create(e: FormEvent) {
    e.preventDefault();
    setBusy(true);
    setFieldErrors({});
    setFormError(null);
    try {
      const created = await operatorsApi.create(form);
      setOperators((list) => [...(list ?? []), created]);
      setForm(EMPTY_FORM);
      setNotice(`Added ${created.name} (${created.plmn})`);
    } catch (err) {
      if (err instanceof ApiError) {
        setFieldErrors(err.fields);
        setFormError(err.message);
      } else setFormError('Could not add the operator');
    } finally {
      setBusy(false);
    }
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
    { key: 'colour', label: 'Map colour', render: (o) => <ColourEditor op={o} all={operators ?? []} onSaved={replace} /> },
  ];

  const err = (k: string) =>
    fieldErrors[k]?.map((m) => (
      <p key={m} className="field-error" id={`op-${k}-error`}>
        {m}
      </p>
    ));

  return (
    <div className="mt-6 grid gap-6 lg:grid-cols-[1fr_20rem]">
      <section className="card min-w-0" aria-labelledby="operators-heading">
        <div className="mb-3 flex flex-wrap items-center gap-3">
          <h2 id="operators-heading">Operators</h2>
          {preview && (
            <span className="ml-auto inline-flex items-center gap-2 text-sm text-ink-600">
              A mast with all of them: <img src={preview} alt="" width={34} height={34} />
            </span>
          )}
        </div>
        <p aria-live="polite" className="mb-2 min-h-5 text-sm text-ink-600" data-testid="operators-notice">
          {notice}
        </p>
        {loadError ? (
          <p role="alert" className="text-alarm-700">
            {loadError}
          </p>
        ) : operators === null ? (
          <p className="text-ink-500">Loading operators…</p>
        ) : (
          <SortableTable
            rows={operators}
            columns={columns}
            rowKey={(o) => o.id}
            initialSort={{ key: 'plmn', dir: 'asc' }}
            empty="No operators yet"
            caption="Operators"
          />
        )}
      </section>
      <section className="card" aria-labelledby="new-operator-heading">
        <h2 id="new-operator-heading">New operator</h2>
        <p className="mt-1 text-sm text-ink-600">It takes the first unused colour of the colour-blind-safe palette; change it afterwards if you like.</p>
        <form className="mt-3 space-y-3" onSubmit={create} noValidate>
          {formError && (
            <p role="alert" className="text-sm text-alarm-700">
              {formError}
            </p>
          )}
          <div>
            <label htmlFor="op-name" className="field-label">
              Name
            </label>
            <input
              id="op-name"
              className="field-input"
              value={form.name}
              onChange={(e) => setForm({ ...form, name: e.target.value })}
              aria-invalid={!!fieldErrors.name}
              aria-describedby="op-name-error"
            />
            {err('name')}
          </div>
          <div className="grid grid-cols-2 gap-3">
            <div>
              <label htmlFor="op-mcc" className="field-label">
                MCC
              </label>
              <input
                id="op-mcc"
                inputMode="numeric"
                className="field-input font-mono"
                value={form.mcc}
                onChange={(e) => setForm({ ...form, mcc: e.target.value })}
                aria-invalid={!!fieldErrors.mcc}
                aria-describedby="op-mcc-error"
              />
              {err('mcc')}
            </div>
            <div>
              <label htmlFor="op-mnc" className="field-label">
                MNC
              </label>
              <input
                id="op-mnc"
                inputMode="numeric"
                className="field-input font-mono"
                value={form.mnc}
                onChange={(e) => setForm({ ...form, mnc: e.target.value })}
                aria-invalid={!!fieldErrors.mnc}
                aria-describedby="op-mnc-error"
              />
              {err('mnc')}
            </div>
          </div>
          <button type="submit" className="btn-primary w-full" disabled={busy}>
            Add operator
          </button>
        </form>
      </section>
    </div>
  );
}
