// A form's submit button.
import { useIsLive } from './use-is-live';

/** Disabled while the form sends, and until the island is live so that a press before then is not lost. */
export function SubmitButton({ pending = false, label, className = 'btn-primary w-full' }: { pending?: boolean; label: string; className?: string }) {
  const live = useIsLive();
  return (
    <button type="submit" className={className} disabled={pending || !live}>
      {label}
    </button>
  );
}
