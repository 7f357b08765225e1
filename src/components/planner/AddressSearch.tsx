import { useEffect, useId, useState } from 'react';
import { asApiError } from '../../lib/client/api';
import type { GeocodeMatchJson } from '../../lib/schemas/addresses';
import { addressesApi } from '../../lib/client/addresses-api';
import { useDebounced } from '../tools/useDebounced';
import { useQuery } from '../ui/use-api';

interface Props {
  onPick: (m: GeocodeMatchJson) => void;
  /** Text to show when the position was set elsewhere (a map click, a shared link). */
  text?: string | null;
}

const NO_MATCH = 'No address matches. Try a postcode, or type coordinates like -47.21, -128.52.';

/** Address or coordinates (decimal or DMS) → a position. Arrow keys and Enter work in the list. */
export default function AddressSearch({ onPick, text }: Props) {
  const [q, setQ] = useState(text ?? '');
  const [active, setActive] = useState(0);
  const [open, setOpen] = useState(false);
  const settled = useDebounced(q.trim(), 200);
  const listId = useId();

  useEffect(() => {
    if (text == null) return;
    setQ(text);
    setOpen(false);
  }, [text]);

  const found = useQuery(settled.length >= 2 ? settled : null, async () => ({ q: settled, items: (await addressesApi.geocode({ q: settled })).items }), {
    failed: 'Search failed',
    keepOnError: false,
    onSuccess: () => setActive(0),
  });
  // A failed search on Enter, shown while its text stays in the box.
  const [typedError, setTypedError] = useState<{ q: string; message: string } | null>(null);
  const items = found.data?.items ?? [];
  // The query the listed suggestions answer: Enter before they catch up searches what was typed.
  const itemsFor = found.data?.q ?? (found.error ? settled : '');
  const error = (typedError?.q === q.trim() ? typedError.message : null) ?? found.error?.message ?? (found.data && items.length === 0 ? NO_MATCH : null);

  const pick = (m: GeocodeMatchJson) => {
    onPick(m);
    setQ(m.label);
    setOpen(false);
  };

  /** Enter on text the suggestions do not answer yet (a paste): search it now and take its best match. */
  async function pickTyped(typed: string) {
    setTypedError(null);
    try {
      const r = await addressesApi.geocode({ q: typed });
      found.setData(() => ({ q: typed, items: r.items }));
      if (r.items[0]) pick(r.items[0]);
    } catch (e) {
      setTypedError({ q: typed, message: asApiError(e, 'Search failed').message });
    }
  }

  return (
    <div className="relative">
      <label htmlFor="plan-address" className="field-label">
        Customer address or coordinates
      </label>
      <input
        id="plan-address"
        className="field-input"
        role="combobox"
        aria-expanded={open && items.length > 0}
        aria-controls={listId}
        aria-autocomplete="list"
        autoComplete="off"
        placeholder="Street, farm, postcode, or lat, lon"
        value={q}
        onChange={(e) => {
          setQ(e.target.value);
          setOpen(true);
        }}
        onFocus={() => setOpen(true)}
        onKeyDown={(e) => {
          if (e.key === 'ArrowDown') setActive((a) => Math.min(a + 1, items.length - 1));
          else if (e.key === 'ArrowUp') setActive((a) => Math.max(a - 1, 0));
          else if (e.key === 'Enter') {
            const typed = q.trim();
            if (typed.length >= 2 && typed !== itemsFor) {
              e.preventDefault();
              void pickTyped(typed);
            } else if (items[active]) {
              e.preventDefault();
              pick(items[active]);
            }
          } else if (e.key === 'Escape') setOpen(false);
        }}
      />
      {error && (
        <p className="mt-1 text-xs text-ink-700" role="status" data-testid="address-error">
          {error}
        </p>
      )}
      {open && items.length > 0 && (
        <ul id={listId} role="listbox" className="absolute z-20 mt-1 max-h-72 w-full overflow-auto rounded-md border border-ink-200 bg-white shadow-lg">
          {items.map((m, i) => (
            <li
              key={`${m.label}-${m.lat}-${m.lon}`}
              role="option"
              aria-selected={i === active}
              className={`cursor-pointer px-3 py-2 text-sm ${i === active ? 'bg-ink-100' : ''}`}
              onMouseDown={(e) => {
                e.preventDefault();
                pick(m);
              }}
              onMouseEnter={() => setActive(i)}
            >
              <span className="font-semibold">{m.label}</span>
              {m.postcode && <span className="ml-2 text-ink-500">{m.postcode}</span>}
              {m.kind === 'coordinates' && <span className="ml-2 text-ink-500">(typed position)</span>}
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
