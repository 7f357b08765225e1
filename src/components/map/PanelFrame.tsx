import type { ReactNode } from 'react';

interface Props {
  labelledBy: string;
  testId: string;
  /** The header's content beside the close button (an h2 with id `labelledBy`). */
  header: ReactNode;
  closeLabel: string;
  onClose: () => void;
  children: ReactNode;
}

/** The map's panel: a side panel from 640 px, a bottom sheet below (panel-offset.ts keeps points clear of it). */
export default function PanelFrame({ labelledBy, testId, header, closeLabel, onClose, children }: Props) {
  return (
    <aside
      aria-labelledby={labelledBy}
      data-testid={testId}
      className="pointer-events-auto absolute inset-x-0 bottom-0 z-30 flex max-h-[58%] flex-col rounded-t-2xl border border-ink-200 bg-white shadow-2xl sm:inset-x-auto sm:bottom-3 sm:right-3 sm:top-3 sm:max-h-none sm:w-[28rem] sm:rounded-xl lg:w-[32rem]"
    >
      <div className="mx-auto mt-2 h-1.5 w-10 shrink-0 rounded-full bg-ink-200 sm:hidden" aria-hidden="true" />
      <header className="flex items-start gap-3 border-b border-ink-100 px-4 py-3">
        {header}
        <button type="button" onClick={onClose} className="rounded p-1.5 text-ink-500 hover:bg-ink-100 hover:text-ink-900" aria-label={closeLabel}>
          <svg aria-hidden="true" viewBox="0 0 20 20" width="18" height="18">
            <path d="M5 5l10 10M15 5L5 15" stroke="currentColor" strokeWidth="2" strokeLinecap="round" />
          </svg>
        </button>
      </header>
      <div className="min-h-0 flex-1 space-y-4 overflow-y-auto px-4 py-3 text-sm">{children}</div>
    </aside>
  );
}
