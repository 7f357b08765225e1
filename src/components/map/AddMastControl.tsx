interface Props {
  placing: boolean;
  onStart: () => void;
  /** Keyboard users: pan with the arrow keys, then place the mast at the centre. */
  onUseCentre: () => void;
  onCancel: () => void;
}

/** "Add mast", then a prompt to click the map where the mast stands. */
export default function AddMastControl({ placing, onStart, onUseCentre, onCancel }: Props) {
  if (!placing)
    return (
      <button
        type="button"
        className="btn self-start border border-ink-300 bg-white px-3 py-1.5 text-sm text-ink-800 shadow-md hover:bg-ink-100"
        onClick={onStart}
      >
        <svg aria-hidden="true" viewBox="0 0 16 16" width="14" height="14" className="inline-block">
          <path d="M8 2v12M2 8h12" stroke="currentColor" strokeWidth="2" strokeLinecap="round" />
        </svg>
        Add mast
      </button>
    );
  return (
    <div role="status" className="space-y-2 rounded-lg border border-ink-200 bg-white/95 p-3 text-sm text-ink-900 shadow-md" data-testid="add-mast-prompt">
      <p>Click the map where the new mast stands.</p>
      <div className="flex flex-wrap gap-2">
        <button type="button" className="btn-secondary px-2.5 py-1 text-xs" onClick={onUseCentre}>
          Use the map centre
        </button>
        <button type="button" className="btn-secondary px-2.5 py-1 text-xs" onClick={onCancel}>
          Cancel
        </button>
      </div>
    </div>
  );
}
