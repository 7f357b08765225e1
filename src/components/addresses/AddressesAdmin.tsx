import { useRef, useState, type FormEvent } from 'react';
import { ApiError } from '../../lib/client/api';
import { addressesApi } from '../../lib/client/addresses-api';
import type { AddressImportJson, AddressJson } from '../../lib/schemas/addresses';
import { MISSING, formatNumber } from '../../lib/domain/format';
import { SortableTable, type Column } from '../ui/SortableTable';
import { useQuery } from '../ui/use-api';
import { useDebounced } from '../tools/useDebounced';
import { InputField, SearchBox, SubmitButton } from '../admin/parts';

const PAGE = 25;

const COLUMNS: Column<AddressJson>[] = [
  { key: 'label', label: 'Label', render: (a) => a.label },
  { key: 'postcode', label: 'Postcode', render: (a) => a.postcode ?? MISSING, className: 'whitespace-nowrap' },
  { key: 'lat', label: 'Lat', render: (a) => formatNumber(a.lat, 5), className: 'text-right tabular-nums' },
  { key: 'lon', label: 'Lon', render: (a) => formatNumber(a.lon, 5), className: 'text-right tabular-nums' },
  { key: 'source', label: 'Source', render: (a) => a.source },
];

interface Outcome {
  kind: 'done' | 'rejected' | 'error';
  message: string;
  summary?: AddressImportJson;
  lines?: { key: string; messages: string[] }[];
}

/** "line 12" → 12, so problems list in file order. */
const lineOf = (key: string) => Number(key.replace(/\D/g, '')) || 0;

export default function AddressesAdmin() {
  const [file, setFile] = useState<File | null>(null);
  const [busy, setBusy] = useState(false);
  const [outcome, setOutcome] = useState<Outcome | null>(null);
  const [query, setQuery] = useState('');
  // Keyset paging: the cursor each page starts after (none for the first), so a page deep in a
  // million addresses costs what the first does.
  const [cursors, setCursors] = useState<Array<string | undefined>>([undefined]);
  const page = cursors.length - 1;
  const q = useDebounced(query.trim(), 200);
  const addresses = useQuery(JSON.stringify({ q, after: cursors[page] }), () => addressesApi.list({ q: q || undefined, limit: PAGE, after: cursors[page] }));
  const list = addresses.data;
  const input = useRef<HTMLInputElement>(null);

  async function upload(e: FormEvent) {
    e.preventDefault();
    if (!file) {
      setOutcome({ kind: 'error', message: 'Choose a CSV file first' });
      return;
    }
    setOutcome(null);
    setBusy(true);
    try {
      // Small files get the server's checks here first, so problems show before anything is sent;
      // large ones stream straight to the server, which checks them as they arrive.
      // The CSV checks load on the first upload, so the page itself ships without them.
      const { ADDRESS_PRECHECK_MAX_BYTES, MAX_REPORTED_ROW_ERRORS, parseAddressCsv } = await import('../../lib/schemas/addresses');
      const checked = file.size <= ADDRESS_PRECHECK_MAX_BYTES ? parseAddressCsv(await file.text()) : null;
      if (checked?.fileErrors.length) {
        setOutcome({ kind: 'rejected', message: checked.fileErrors.join(' ') });
        return;
      }
      if (checked?.errors.length) {
        const n = checked.errors.length;
        setOutcome({
          kind: 'rejected',
          message: `${n} row${n === 1 ? ' has' : 's have'} problems; nothing was imported. Fix ${n === 1 ? 'it' : 'them'} and import the file again.`,
          lines: checked.errors.slice(0, MAX_REPORTED_ROW_ERRORS).map((x) => ({ key: `line ${x.line}`, messages: x.messages })),
        });
        return;
      }
      const summary = await addressesApi.importFile(file);
      setOutcome({ kind: 'done', message: `Imported ${file.name}`, summary });
      setFile(null);
      if (input.current) input.current.value = '';
      setCursors([undefined]);
      addresses.refetch();
    } catch (err) {
      if (err instanceof ApiError) {
        const lines = Object.entries(err.fields)
          .filter(([k]) => k.startsWith('line '))
          .sort(([a], [b]) => lineOf(a) - lineOf(b))
          .map(([key, messages]) => ({ key, messages }));
        setOutcome({ kind: lines.length ? 'rejected' : 'error', message: err.message, lines });
      } else setOutcome({ kind: 'error', message: 'Could not import the file' });
    } finally {
      setBusy(false);
    }
  }

  const pages = list ? Math.max(1, Math.ceil(list.total / PAGE)) : 1;
  const about = list && !list.total_exact ? 'about ' : '';

  return (
    <div className="mt-6 grid gap-6 lg:grid-cols-[22rem_1fr]">
      <section className="card min-w-0 self-start" aria-labelledby="import-heading">
        <h2 id="import-heading">Import a CSV</h2>
        <form className="mt-3 space-y-3" onSubmit={upload} noValidate>
          <InputField
            id="addr-file"
            label="File"
            inputRef={input}
            type="file"
            accept=".csv,text/csv"
            onChange={(e) => setFile(e.target.files?.[0] ?? null)}
            hint="Any size up to the configured limit (512 MB unless IMPORT_MAX_BYTES says otherwise). First line: label,postcode,lat,lon"
          />
          <pre className="whitespace-pre-wrap break-all rounded bg-ink-50 p-2 text-xs text-ink-700" aria-label="Example">{`label,postcode,lat,lon
"Alder Farm, Crake Lane",KLV-9001,-47.2101,-128.5203`}</pre>
          <SubmitButton pending={busy} label={busy ? 'Importing…' : 'Import addresses'} />
        </form>
        <div aria-live="polite" className="mt-4" data-testid="import-outcome">
          {outcome && (
            <div
              className={[
                'rounded-md border p-3 text-sm',
                outcome.kind === 'done' ? 'border-moss-500 bg-moss-50 text-moss-700' : 'border-alarm-500 bg-alarm-50 text-alarm-700',
              ].join(' ')}
            >
              <p className="font-semibold" role={outcome.kind === 'done' ? undefined : 'alert'}>
                {outcome.message}
              </p>
              {outcome.summary && (
                <p className="mt-1">
                  {outcome.summary.rows} rows: {outcome.summary.inserted} new, {outcome.summary.updated} changed or moved, {outcome.summary.unchanged}{' '}
                  unchanged.
                </p>
              )}
              {outcome.lines && outcome.lines.length > 0 && (
                <ul className="mt-2 max-h-72 space-y-1 overflow-y-auto text-ink-800">
                  {outcome.lines.map((l) => (
                    <li key={l.key}>
                      <span className="font-semibold">{l.key[0]!.toUpperCase() + l.key.slice(1)}:</span> {l.messages.join('; ')}
                    </li>
                  ))}
                </ul>
              )}
            </div>
          )}
        </div>
      </section>

      <section className="card min-w-0" aria-labelledby="addresses-heading">
        <div className="mb-3 flex flex-wrap items-center gap-3">
          <h2 id="addresses-heading">Addresses {list && <span className="font-normal text-ink-600">({about + String(list.total)})</span>}</h2>
          <SearchBox
            label="Search addresses"
            placeholder="Search label or postcode"
            className="sm:w-72"
            value={query}
            onChange={(v) => {
              setQuery(v);
              setCursors([undefined]);
            }}
          />
        </div>
        {addresses.error ? (
          <p role="alert" className="text-alarm-700">
            {addresses.error.message}
          </p>
        ) : !list ? (
          <p className="text-ink-500">Loading addresses…</p>
        ) : (
          <>
            <SortableTable
              rows={list.items}
              columns={COLUMNS}
              rowKey={(a) => a.id}
              caption="Addresses"
              empty={q ? 'No address matches your search' : 'No addresses yet'}
            />
            <nav className="mt-3 flex items-center justify-between text-sm" aria-label="Pages">
              <button type="button" className="btn-secondary py-1" disabled={page === 0} onClick={() => setCursors((c) => c.slice(0, -1))}>
                Previous
              </button>
              <span className="text-ink-600">
                Page {page + 1} of {about + String(pages)}
              </span>
              <button type="button" className="btn-secondary py-1" disabled={!list?.next} onClick={() => list?.next && setCursors((c) => [...c, list.next!])}>
                Next
              </button>
            </nav>
          </>
        )}
      </section>
    </div>
  );
}
