import { useEffect, useId, useRef, useState, type KeyboardEvent } from 'react';
import { mapApi } from '../../lib/client/masts-api';
import type { SearchHitJson } from '../../lib/schemas/mast-responses';
import { useDebounced } from '../tools/useDebounced';
import { useQuery } from '../ui/use-api';

interface Props {
  onPick: (hit: SearchHitJson) => void;
}

const KIND_LABELS: Record<SearchHitJson['kind'], string> = { mast: 'Mast', place: 'Place' };

/** Finds a mast (name or reference) or a place by name; a keyboard-friendly combobox. */
export default function MapSearch({ onPick }: Props) {
  const id = useId();
  const listId = `${id}-list`;
  const inputRef = useRef<HTMLInputElement>(null);
  const [text, setText] = useState('');
  const [open, setOpen] = useState(false);
  const [active, setActive] = useState(-1);
  const typed = text.trim();
  const settled = useDebounced(typed, 180);
  // Cleared text asks nothing at once; typed text is asked once it has settled.
  const found = useQuery(typed && settled ? settled : null, async () => ({ q: settled, items: (await mapApi.search(settled)).items }), {
    failed: 'Search failed',
    keepOnError: false,
    onSuccess: (r) => setActive(r.items.length ? 0 : -1),
  });
  const hits = found.data?.items ?? [];
  const message = found.error?.message ?? (found.data && hits.length === 0 ? `Nothing found for “${found.data.q}”` : null);

  // "/" focuses the search box from anywhere on the map page.
  useEffect(() => {
    const onKey = (e: globalThis.KeyboardEvent) => {
      const target = e.target as HTMLElement | null;
      if (e.key !== '/' || e.ctrlKey || e.metaKey || e.altKey) return;
      if (target && (target.isContentEditable || ['INPUT', 'TEXTAREA', 'SELECT'].includes(target.tagName))) return;
      e.preventDefault();
      inputRef.current?.focus();
    };
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  }, []);

  function pick(hit: SearchHitJson | undefined) {
    if (!hit) return;
    setText(hit.name);
    setOpen(false);
    onPick(hit);
  }

  function onKeyDown(e: KeyboardEvent<HTMLInputElement>) {
    if (e.key === 'ArrowDown') {
      e.preventDefault();
      setOpen(true);
      setActive((i) => (hits.length ? (i + 1) % hits.length : -1));
    } else if (e.key === 'ArrowUp') {
      e.preventDefault();
      setOpen(true);
      setActive((i) => (hits.length ? (i - 1 + hits.length) % hits.length : -1));
    } else if (e.key === 'Enter') {
      e.preventDefault();
      pick(hits[active] ?? hits[0]);
    } else if (e.key === 'Escape') {
      if (open) setOpen(false);
      else setText('');
    }
  }

  const expanded = open && (hits.length > 0 || !!message);

  return (
    <div className="relative w-full" data-testid="map-search">
      <label htmlFor={`${id}-input`} className="sr-only">
        Search masts and places
      </label>
      <input
        ref={inputRef}
        id={`${id}-input`}
        type="search"
        role="combobox"
        aria-autocomplete="list"
        aria-expanded={expanded}
        aria-controls={listId}
        aria-activedescendant={expanded && active >= 0 ? `${id}-opt-${active}` : undefined}
        autoComplete="off"
        placeholder="Search masts and places  ( / )"
        className="field-input pr-3 shadow-md"
        value={text}
        onChange={(e) => {
          setText(e.target.value);
          setOpen(true);
        }}
        onFocus={() => setOpen(true)}
        onBlur={() => setTimeout(() => setOpen(false), 150)}
        onKeyDown={onKeyDown}
      />
      <ul
        id={listId}
        role="listbox"
        aria-label="Search results"
        className={
          expanded
            ? 'absolute left-0 right-0 top-full z-20 mt-1 max-h-72 overflow-y-auto rounded-md border border-ink-200 bg-white py-1 text-sm shadow-lg'
            : 'hidden'
        }
      >
        {hits.map((h, i) => (
          <li
            key={`${h.kind}-${h.id}`}
            id={`${id}-opt-${i}`}
            role="option"
            aria-selected={i === active}
            className={['flex cursor-pointer items-baseline gap-2 px-3 py-1.5', i === active ? 'bg-ink-100' : ''].join(' ')}
            onMouseDown={(e) => e.preventDefault()}
            onMouseEnter={() => setActive(i)}
            onClick={() => pick(h)}
          >
            <span className="rounded bg-ink-50 px-1.5 text-[11px] font-semibold uppercase tracking-wide text-ink-500">{KIND_LABELS[h.kind]}</span>
            <span className="font-semibold text-ink-900">{h.name}</span>
            {h.detail && <span className="truncate text-xs text-ink-500">{h.detail}</span>}
          </li>
        ))}
        {message && hits.length === 0 && (
          <li className="px-3 py-1.5 text-ink-500" role="presentation">
            {message}
          </li>
        )}
      </ul>
    </div>
  );
}
