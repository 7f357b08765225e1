// The pieces the admin pages are built from: a list card (heading, live notice, loading and error
// states, a sortable table with an optional search), labelled fields with their errors, a form card
// whose submit waits for the island and shows the form's error, and a two-step delete.
import { useCallback, useEffect, useMemo, useRef, useState, type FormEvent, type InputHTMLAttributes, type ReactNode, type Ref } from 'react';
import { asApiError } from '../../lib/client/api';
import type { QueryState, SubmitState } from '../ui/api-state';
import { SortableTable, type Column } from '../ui/SortableTable';
import { SubmitButton } from '../ui/SubmitButton';
import { Field, FieldErrorText, fieldAria, type FieldFrame } from '../ui/field';

export { Field, FieldErrorText, SubmitButton, fieldAria };

// --- Lists ------------------------------------------------------------------------------------------

const FORM_COLUMN = { narrow: 'lg:grid-cols-[1fr_20rem]', wide: 'lg:grid-cols-[1fr_22rem]' } as const;

/** An admin page's body: the list card, and beside it from 1024 px the card of the form that adds to it. */
export function ListBesideForm({ form = 'narrow', children }: { form?: keyof typeof FORM_COLUMN; children: ReactNode }) {
  return <div className={`mt-6 grid gap-6 ${FORM_COLUMN[form]}`}>{children}</div>;
}

interface Identified {
  id: string;
}

/** The list with `item` in place of the one with its id, or added at the end. */
export const upsertById = <T extends Identified>(list: T[] | null, item: T): T[] =>
  list?.some((x) => x.id === item.id) ? list.map((x) => (x.id === item.id ? item : x)) : [...(list ?? []), item];

/** The list without the item of that id. */
export const withoutId = <T extends Identified>(list: T[] | null, id: string): T[] => (list ?? []).filter((x) => x.id !== id);

/**
 * A one-line outcome shown in the list's live region: `attempt` runs a row action and shows what
 * it answers, or the API's message when it fails.
 */
export function useNotice() {
  const [notice, setNotice] = useState<string | null>(null);
  const attempt = useCallback(async (action: () => Promise<string>, failed: string) => {
    setNotice(null);
    try {
      setNotice(await action());
    } catch (e) {
      setNotice(asApiError(e, failed).message);
    }
  }, []);
  return { notice, setNotice, attempt };
}

interface ListCardProps<T> {
  /** Prefix of the heading id and the notice's test id (`${id}-heading`, `${id}-notice`). */
  id: string;
  title: string;
  /** Beside the heading (a button, a preview). */
  tools?: ReactNode;
  /** The live line under the heading; leave it out when the page announces outcomes elsewhere. */
  notice?: ReactNode;
  /** The list's query: its rows as loaded (null while it loads) and the failure that stopped it. */
  list: Pick<QueryState<T[]>, 'data' | 'error'>;
  columns: Column<T>[];
  /** By name, A to Z, unless told otherwise. */
  initialSort?: { key: string; dir: 'asc' | 'desc' };
  /** What the rows are, in the table's caption for screen readers and the loading line; the title unless told otherwise. */
  caption?: string;
  empty: ReactNode;
  /** A search box above the table that keeps the rows whose text contains what is typed. */
  search?: { label: string; placeholder: string; text: (row: T) => string; noMatch: string };
}

const BY_NAME = { key: 'name', dir: 'asc' } as const;
const rowId = (row: Identified) => row.id;

/** A card with a sortable table of records (one row an id), its loading and error states and a live notice line; below 640 px the rows are cards. */
export function ListCard<T extends Identified>({
  id,
  title,
  tools,
  notice,
  list: { data: rows, error },
  columns,
  initialSort = BY_NAME,
  caption = title,
  empty,
  search,
}: ListCardProps<T>) {
  const [query, setQuery] = useState('');
  const q = query.trim().toLowerCase();
  const shown = useMemo(() => (rows && search && q ? rows.filter((r) => search.text(r).toLowerCase().includes(q)) : rows), [rows, search, q]);
  return (
    <section className="card min-w-0" aria-labelledby={`${id}-heading`}>
      <div className="mb-3 flex flex-wrap items-center gap-3">
        <h2 id={`${id}-heading`}>{title}</h2>
        {search && <SearchBox label={search.label} placeholder={search.placeholder} value={query} onChange={setQuery} />}
        {tools}
      </div>
      {notice !== undefined && (
        <p aria-live="polite" className="mb-2 min-h-5 text-sm text-ink-600" data-testid={`${id}-notice`}>
          {notice}
        </p>
      )}
      {error ? (
        <p role="alert" className="text-alarm-700">
          {error.message}
        </p>
      ) : shown === null ? (
        <p className="text-ink-500">Loading {caption.toLowerCase()}…</p>
      ) : (
        <SortableTable rows={shown} columns={columns} rowKey={rowId} initialSort={initialSort} empty={search && q ? search.noMatch : empty} caption={caption} />
      )}
    </section>
  );
}

/** A search box that takes the row's full width on a phone and sits at the right of a heading from 640 px. */
export function SearchBox({
  label,
  placeholder,
  value,
  onChange,
  className = 'sm:w-64',
}: {
  label: string;
  placeholder: string;
  value: string;
  onChange: (value: string) => void;
  className?: string;
}) {
  return (
    <label className="flex w-full items-center gap-2 text-sm sm:ml-auto sm:w-auto">
      <span className="sr-only">{label}</span>
      <input type="search" placeholder={placeholder} className={`field-input w-full ${className}`} value={value} onChange={(e) => onChange(e.target.value)} />
    </label>
  );
}

// --- Fields -----------------------------------------------------------------------------------------

type InputProps = Omit<InputHTMLAttributes<HTMLInputElement>, 'id'> & FieldFrame & { inputRef?: Ref<HTMLInputElement> };

const FILE_INPUT =
  'block w-full text-sm file:mr-3 file:rounded-md file:border file:border-ink-300 file:bg-white file:px-3 file:py-1.5 file:text-sm file:font-semibold file:text-ink-800';

/** A labelled input (a file picker when `type="file"`) with its hint and errors. */
export function InputField({ id, label, errors, hint, className, inputRef, ...input }: InputProps) {
  const base = input.type === 'file' ? FILE_INPUT : 'field-input';
  return (
    <Field id={id} label={label} errors={errors} hint={hint}>
      <input ref={inputRef} className={className ? `${base} ${className}` : base} {...fieldAria({ id, errors, hint })} {...input} />
    </Field>
  );
}

/** A labelled choice of fixed values with its errors. */
export function SelectField<V extends string>({
  id,
  label,
  errors,
  hint,
  value,
  options,
  labels,
  onChange,
  disabled,
}: FieldFrame & { value: V; options: readonly V[]; labels: Record<V, string>; onChange: (value: V) => void; disabled?: boolean }) {
  return (
    <Field id={id} label={label} errors={errors} hint={hint}>
      <select className="field-input" value={value} disabled={disabled} onChange={(e) => onChange(e.target.value as V)} {...fieldAria({ id, errors, hint })}>
        {options.map((o) => (
          <option key={o} value={o}>
            {labels[o]}
          </option>
        ))}
      </select>
    </Field>
  );
}

// --- Forms ------------------------------------------------------------------------------------------

/** The form's own message (what the server or the form's check refused), announced at once. */
export function FormError({ error }: { error: string | null | undefined }) {
  if (!error) return null;
  return (
    <p role="alert" className="text-sm text-alarm-700">
      {error}
    </p>
  );
}

interface FormCardProps {
  /** Prefix of the heading id (`${id}-heading`). */
  id: string;
  title: ReactNode;
  intro?: ReactNode;
  onSubmit: () => void;
  /** The form's writes: pending while it sends, and the failure shown above the fields. */
  sending: SubmitState;
  submitLabel: string;
  pendingLabel?: string;
  /** In place of the one submit button (e.g. Save beside Cancel). */
  actions?: ReactNode;
  children: ReactNode;
  className?: string;
}

/** A card holding one form: heading, intro, the form's error, the fields and a submit that waits until the island is live. */
export function FormCard({ id, title, intro, onSubmit, sending: { pending, error }, submitLabel, pendingLabel, actions, children, className }: FormCardProps) {
  const submit = (e: FormEvent) => {
    e.preventDefault();
    onSubmit();
  };
  return (
    <section id={id} className={`card min-w-0 ${className ?? ''}`} aria-labelledby={`${id}-heading`}>
      <h2 id={`${id}-heading`}>{title}</h2>
      {intro && <p className="mt-1 text-sm text-ink-600">{intro}</p>}
      <form className="mt-3 space-y-3" onSubmit={submit} noValidate>
        <FormError error={error?.message} />
        {children}
        {actions ?? <SubmitButton pending={pending} label={pending && pendingLabel ? pendingLabel : submitLabel} />}
      </form>
    </section>
  );
}

// --- Row actions ------------------------------------------------------------------------------------

/**
 * A row's Delete, asked twice: the first press offers "Delete <name>" beside "Keep" (which takes
 * the focus, so Enter twice does not delete); Keep goes back. `children` are the row's other actions,
 * kept on one line beside it from 640 px (a table row) and wrapping on a phone's card.
 */
export function DeleteAction({ name, onDelete, children }: { name: string; onDelete: () => void; children?: ReactNode }) {
  const [asking, setAsking] = useState(false);
  const keepRef = useRef<HTMLButtonElement>(null);
  const deleteRef = useRef<HTMLButtonElement>(null);
  const wasAsking = useRef(false);
  useEffect(() => {
    if (asking) keepRef.current?.focus();
    else if (wasAsking.current) deleteRef.current?.focus();
    wasAsking.current = asking;
  }, [asking]);
  return (
    <span className="flex flex-wrap gap-2 sm:flex-nowrap">
      {asking ? (
        <>
          <button
            type="button"
            className="btn-danger py-1"
            onClick={() => {
              setAsking(false);
              onDelete();
            }}
          >
            Delete {name}
          </button>
          <button ref={keepRef} type="button" className="btn-secondary py-1" onClick={() => setAsking(false)}>
            Keep
          </button>
        </>
      ) : (
        <>
          {children}
          <button ref={deleteRef} type="button" className="btn-secondary py-1" aria-label={`Delete ${name}`} onClick={() => setAsking(true)}>
            Delete
          </button>
        </>
      )}
    </span>
  );
}
