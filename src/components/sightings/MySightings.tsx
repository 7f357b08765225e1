// The signed-in person's sightings and what became of them, with those still on this device.
import { useEffect } from 'react';
import { keepFlushing } from '../../lib/client/sighting-outbox';
import { sightingsApi } from '../../lib/client/sightings-api';
import { SIGHTING_STATUS_LABELS, SIGHTING_STRUCTURE_LABELS, type SightingStatus } from '../../lib/schemas/sightings';
import OutboxList from './OutboxList';
import { useQuery } from '../ui/use-api';
import { formatDateTime, formatLatLon, formatMetres } from '../../lib/domain/format';

const TONE: Record<SightingStatus, string> = {
  pending: 'bg-ember-100 text-ember-700',
  approved: 'bg-moss-100 text-moss-700',
  merged: 'bg-moss-100 text-moss-700',
  rejected: 'bg-alarm-100 text-alarm-700',
};

const when = formatDateTime;

export default function MySightings() {
  const mine = useQuery('mine', () => sightingsApi.mine());
  const items = mine.data?.items ?? null;
  const error = mine.error?.message;

  useEffect(() => keepFlushing(), []);

  return (
    <div className="mx-auto max-w-xl space-y-4">
      <OutboxList onSent={mine.refetch} />
      {error && <p className="rounded-md border border-ember-500 bg-ember-50 p-3 text-ember-700">{error}</p>}
      {items === null && !error && <p className="text-ink-600">Loading…</p>}
      {items?.length === 0 && <p className="text-ink-600">No sightings sent yet.</p>}
      <ul className="space-y-3" aria-label="My sightings">
        {items?.map((s) => (
          <li key={s.id} className="card space-y-2" data-testid="my-sighting">
            <div className="flex flex-wrap items-center justify-between gap-2">
              <span className={`rounded px-2 py-0.5 text-sm font-semibold ${TONE[s.status]}`}>{SIGHTING_STATUS_LABELS[s.status]}</span>
              <span className="text-sm text-ink-600">seen {when(s.observed_at)}</span>
            </div>
            <p className="text-base text-ink-900">
              {SIGHTING_STRUCTURE_LABELS[s.structure_type]}
              {s.estimated_height_m !== null && <> · about {formatMetres(s.estimated_height_m, 0)}</>} · {formatLatLon(s.lat, s.lon)}
            </p>
            {(s.operators.length > 0 || s.cells.length > 0) && (
              <p className="text-sm text-ink-700">
                {s.operators.map((o) => o.name).join(', ')}
                {s.cells.length > 0 && (
                  <>
                    {' '}
                    · {s.cells.length} cell{s.cells.length === 1 ? '' : 's'}
                  </>
                )}
              </p>
            )}
            {s.photos.length > 0 && (
              <div className="flex gap-2">
                {s.photos.map((p) => (
                  <img key={p.id} src={p.thumb_url} alt="" loading="lazy" className="h-16 w-16 rounded object-cover" />
                ))}
              </div>
            )}
            {s.status !== 'pending' && (
              <p className="text-sm text-ink-700">
                {s.decided_by ? `${s.decided_by.name}, ` : ''}
                {s.decided_at ? when(s.decided_at) : ''}
                {s.mast_id && (
                  <>
                    {' · '}
                    <a className="underline" href={`/map?mast=${s.mast_id}`}>
                      on the map
                    </a>
                  </>
                )}
                {s.decision_reason && <span className="block">Reason: {s.decision_reason}</span>}
              </p>
            )}
          </li>
        ))}
      </ul>
    </div>
  );
}
