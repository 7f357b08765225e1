// Sightings kept on this device until the server has them.
import { useEffect, useState } from 'react';
import { SIGHTING_STRUCTURE_LABELS } from '../../lib/schemas/sightings';
import { formatLatLon } from '../../lib/domain/format';
import { flushOutbox, listOutbox, onOutboxChange, removeFromOutbox, saveToOutbox } from '../../lib/client/sighting-outbox';
import { useQuery } from '../ui/use-api';

export default function OutboxList({ onSent }: { onSent?: () => void }) {
  // What this device keeps (IndexedDB); a device that cannot keep anything shows nothing.
  const outbox = useQuery('outbox', () => listOutbox(), { keepOnError: false });
  const entries = outbox.data ?? [];
  const refetch = outbox.refetch;
  const [online, setOnline] = useState(true);

  useEffect(() => {
    setOnline(navigator.onLine);
    const up = () => setOnline(true);
    const down = () => setOnline(false);
    window.addEventListener('online', up);
    window.addEventListener('offline', down);
    const off = onOutboxChange(() => {
      refetch();
      onSent?.();
    });
    return () => {
      off();
      window.removeEventListener('online', up);
      window.removeEventListener('offline', down);
    };
  }, [onSent, refetch]);

  if (entries.length === 0) return null;
  return (
    <section className="card space-y-2 border-ember-500" aria-label="Waiting to send" data-testid="outbox">
      <h2>On this device</h2>
      <p className="text-sm text-ink-700">{online ? 'Sending when the server answers…' : 'No connection: these go as soon as there is one.'}</p>
      <ul className="divide-y divide-ink-100">
        {entries.map((e) => (
          <li key={e.clientUuid} className="flex flex-wrap items-center justify-between gap-2 py-2 text-sm">
            <span>
              <span
                className={`mr-2 rounded px-2 py-0.5 text-xs font-semibold ${e.state === 'waiting' ? 'bg-ember-100 text-ember-700' : 'bg-alarm-100 text-alarm-700'}`}
              >
                {e.state === 'waiting' ? 'Waiting to send' : 'Refused'}
              </span>
              {SIGHTING_STRUCTURE_LABELS[e.sighting.structure_type] ?? 'Sighting'} at {formatLatLon(Number(e.sighting.lat), Number(e.sighting.lon), 4)} ·{' '}
              {e.photos.length} photo{e.photos.length === 1 ? '' : 's'}
              {e.error && <span className="block text-alarm-700">{e.error}</span>}
            </span>
            {e.state === 'refused' ? (
              <span className="flex gap-2">
                <button
                  type="button"
                  className="btn-secondary min-h-10"
                  onClick={() => saveToOutbox({ ...e, state: 'waiting', error: undefined }).then(() => flushOutbox())}
                >
                  Try again
                </button>
                <button type="button" className="btn-danger min-h-10" onClick={() => removeFromOutbox(e.clientUuid)}>
                  Discard
                </button>
              </span>
            ) : (
              online && (
                <button type="button" className="btn-secondary min-h-10" onClick={() => flushOutbox()}>
                  Send now
                </button>
              )
            )}
          </li>
        ))}
      </ul>
    </section>
  );
}
