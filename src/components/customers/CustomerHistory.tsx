// What happened to a customer and their plans, newest first, in words.
import type { HistoryEntryJson } from '../../lib/schemas/customers';
import { formatDateTime } from '../../lib/domain/format';

function describe(e: HistoryEntryJson): string {
  const what = e.entity === 'plan' ? `Plan ${e.entity_id}` : 'Customer';
  if (e.action === 'create') return `${what} created`;
  if (e.action === 'erase') return `${what}: personal data erased on request`;
  if (e.action === 'check') {
    const d = e.details ?? {};
    return `${what}: ${d.phase === 'after' ? 'after-install' : 'before'} check recorded (${d.readings ?? 0} readings, ${d.speed_tests ?? 0} speed tests)`;
  }
  const parts = e.changes.map((c) => {
    if (c.field === 'state') return `${c.before} → ${c.after}`;
    if (c.field === 'figures') return 'figures updated';
    const show = (v: unknown) => {
      const text = v === null || v === '' ? '—' : typeof v === 'object' ? '…' : String(v);
      return text.length > 48 ? `${text.slice(0, 47)}…` : text;
    };
    return `${c.field.replace(/_/g, ' ')}: ${show(c.before)} → ${show(c.after)}`;
  });
  return `${what}: ${parts.join('; ') || 'saved without changes'}`;
}

export function CustomerHistory({ entries }: { entries: HistoryEntryJson[] }) {
  return (
    <section className="card min-w-0 self-start" aria-labelledby="history-heading">
      <h2 id="history-heading">History</h2>
      {entries.length === 0 ? (
        <p className="mt-2 text-sm text-ink-500">Nothing recorded yet.</p>
      ) : (
        <ol className="mt-2 space-y-2 text-sm" data-testid="customer-history">
          {entries.map((e) => (
            <li key={e.id} className="border-l-2 border-ink-200 pl-3">
              <p>{describe(e)}</p>
              <p className="text-xs text-ink-500">
                <time dateTime={e.at}>{formatDateTime(e.at)}</time>
                {e.user_name && ` · ${e.user_name}`}
              </p>
            </li>
          ))}
        </ol>
      )}
    </section>
  );
}
