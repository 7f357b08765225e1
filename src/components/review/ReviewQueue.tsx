import { useEffect, useMemo, useState, type FormEvent } from 'react';
import { checkWith } from '../../lib/client/api';
import { reviewApi } from '../../lib/client/review-api';
import type { DuplicateCandidateJson, ReviewItemJson } from '../../lib/schemas/review';
import { DECISION_LABELS, DecisionSchema, type Decision } from '../../lib/schemas/review';
import { STRUCTURE_TYPE_LABELS } from '../../lib/schemas/mast-enums';
import ReviewMap from './ReviewMap';
import CellsSideBySide from './CellsSideBySide';
import { formatDateTime, formatDistance, formatLatLon } from '../../lib/domain/format';
import { Field, fieldAria } from '../ui/field';
import { useQuery, useSubmit } from '../ui/use-api';

const fmtDate = formatDateTime;
const count = (n: number, one: string) => `${n} ${one}${n === 1 ? '' : 's'}`;
const fmtDistance = formatDistance;
const POSITION_FROM: Record<string, string> = { photo: "the photo's GPS tags", device: "the phone's location", map: 'a click on the map' };

function SubmitterRecord({ r }: { r: ReviewItemJson['submitter'] }) {
  const decided = r.approved + r.merged + r.rejected;
  if (decided === 0) return <span className="text-ink-500">first report</span>;
  return (
    <span>
      <span className="text-moss-700">{r.approved + r.merged} accepted</span> ·{' '}
      <span className={r.rejected ? 'text-alarm-700' : ''}>{r.rejected} rejected</span>
    </span>
  );
}

function defaultName(item: ReviewItemJson) {
  return `${STRUCTURE_TYPE_LABELS[item.sighting.structure_type]} (sighting ${item.sighting.id})`;
}

interface DecisionFormProps {
  item: ReviewItemJson;
  candidate: DuplicateCandidateJson | null;
  onDecided: (message: string) => void;
  onStale: (message: string) => void;
}

function DecisionForm({ item, candidate, onDecided, onStale }: DecisionFormProps) {
  const suggested: Decision = candidate && (candidate.shared_cells > 0 || candidate.distance_m < 50) ? 'merge' : 'approve';
  const [decision, setDecision] = useState<Decision>(suggested);
  const [name, setName] = useState(defaultName(item));
  const [reason, setReason] = useState('');
  const saving = useSubmit({ failed: 'Could not save the decision' });
  const fields = saving.fields;
  const id = item.sighting.id;

  useEffect(() => {
    setDecision(suggested);
    // A new sighting or candidate suggests afresh; typing keeps the choice.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [id, candidate?.mast.id]);

  async function submit(e: FormEvent) {
    e.preventDefault();
    const body = {
      decision,
      mast_id: decision === 'merge' ? (candidate?.mast.id ?? null) : null,
      reason: reason.trim() || null,
      name: decision === 'approve' ? name.trim() || null : null,
    };
    const local = checkWith(DecisionSchema, body);
    const sent = await saving.submit(() => reviewApi.decide(id, body), {
      check: () => local,
      checkMessage: local?.mast_id ? 'Choose a mast from the list to merge into' : undefined,
    });
    if (!sent.ok) {
      // Someone else decided first: the queue reloads and says so above it.
      if (sent.error.status === 409) {
        saving.fail(null);
        onStale(sent.error.message);
      }
      return;
    }
    const r = sent.data;
    const who = item.sighting.author.name;
    onDecided(
      r.sighting.status === 'approved'
        ? `Approved: new mast "${r.mast?.name}" with ${count(r.added_cells, 'cell')}. ${who} gets an e-mail.`
        : r.sighting.status === 'merged'
          ? `Merged into "${r.mast?.name}": ${count(r.added_cells, 'new cell')}, ${r.observed_cells} confirmed. ${who} gets an e-mail.`
          : `Rejected. ${who} gets an e-mail with your reason.`,
    );
  }

  const choice = (d: Decision, disabled = false, hint?: string) => (
    <label
      className={`flex min-h-11 cursor-pointer items-start gap-2 rounded-md border px-3 py-2 text-sm ${decision === d ? 'border-ink-700 bg-ink-50' : 'border-ink-200'} ${disabled ? 'cursor-not-allowed opacity-50' : ''}`}
    >
      <input
        type="radio"
        name={`decision-${id}`}
        value={d}
        className="mt-1 h-4 w-4"
        checked={decision === d}
        disabled={disabled}
        onChange={() => setDecision(d)}
      />
      <span>
        <span className="font-semibold">{DECISION_LABELS[d]}</span>
        {hint && <span className="block text-xs text-ink-600">{hint}</span>}
      </span>
    </label>
  );

  return (
    <form className="space-y-3" onSubmit={submit} noValidate aria-labelledby={`decide-${id}`}>
      <h3 id={`decide-${id}`}>Decision</h3>
      {saving.error && (
        <p role="alert" className="rounded-md border border-alarm-100 bg-alarm-50 px-3 py-2 text-sm text-alarm-700">
          {saving.error.message}
        </p>
      )}
      <fieldset className="space-y-2">
        <legend className="sr-only">What becomes of this sighting</legend>
        {choice('approve', false, 'A new mast with the reported cells')}
        {choice(
          'merge',
          !candidate,
          candidate ? `Into ${candidate.mast.name}: adds cells it lacks, confirms the others, keeps the photos` : 'No mast within reach to merge into',
        )}
        {choice('reject', false, 'Nothing changes on the map; the reason goes to the submitter')}
      </fieldset>
      {decision === 'approve' && (
        <Field id={`name-${id}`} label="Name of the new mast" errors={fields.name}>
          <input
            {...fieldAria({ id: `name-${id}`, errors: fields.name })}
            className="field-input min-h-11 text-base sm:text-sm"
            value={name}
            onChange={(e) => setName(e.target.value)}
          />
        </Field>
      )}
      <Field id={`reason-${id}`} label={decision === 'reject' ? 'Reason (required)' : 'Note to the submitter (optional)'} errors={fields.reason}>
        <textarea
          {...fieldAria({ id: `reason-${id}`, errors: fields.reason })}
          rows={3}
          className="field-input text-base sm:text-sm"
          value={reason}
          onChange={(e) => setReason(e.target.value)}
          placeholder={decision === 'reject' ? 'e.g. This is a floodlight pole, not a mast' : ''}
        />
      </Field>
      {fields.mast_id && <p className="field-error">{fields.mast_id.join(' ')}</p>}
      <button type="submit" className={`${decision === 'reject' ? 'btn-danger' : 'btn-primary'} min-h-11 w-full`} disabled={saving.pending}>
        {saving.pending
          ? 'Saving…'
          : decision === 'approve'
            ? 'Approve as a new mast'
            : decision === 'merge'
              ? `Merge into ${candidate?.mast.name ?? 'the mast'}`
              : 'Reject the sighting'}
      </button>
    </form>
  );
}

function SightingDetail({
  item,
  radiusM,
  onDecided,
  onStale,
}: {
  item: ReviewItemJson;
  radiusM: number;
  onDecided: (m: string) => void;
  onStale: (m: string) => void;
}) {
  const s = item.sighting;
  const [mastId, setMastId] = useState<string | null>(item.candidates[0]?.mast.id ?? null);
  useEffect(() => setMastId(item.candidates[0]?.mast.id ?? null), [item]);
  const candidate = item.candidates.find((c) => c.mast.id === mastId) ?? null;
  const mapMasts = useMemo(() => item.candidates.map((c, i) => ({ id: c.mast.id, name: c.mast.name, lat: c.mast.lat, lon: c.mast.lon, rank: i + 1 })), [item]);

  return (
    <article className="card min-w-0 space-y-4" aria-labelledby={`sighting-${s.id}`} data-testid="review-detail">
      <header>
        <h2 id={`sighting-${s.id}`}>
          {STRUCTURE_TYPE_LABELS[s.structure_type]}
          {s.estimated_height_m !== null && `, about ${Math.round(s.estimated_height_m)} m`}
        </h2>
        <p className="text-sm text-ink-600">
          Seen {fmtDate(s.observed_at)} by <span className="font-semibold">{s.author.name}</span> (<SubmitterRecord r={item.submitter} />
          ). Position from {POSITION_FROM[s.position_source]}
          {s.position_accuracy_m !== null && ` (±${Math.round(s.position_accuracy_m)} m)`}: {formatLatLon(s.lat, s.lon)}.
        </p>
        {s.notes && <p className="mt-2 whitespace-pre-line rounded bg-ink-50 px-3 py-2 text-sm text-ink-800">{s.notes}</p>}
      </header>

      <div className="h-64 overflow-hidden rounded-md border border-ink-200 sm:h-80" data-testid="review-map">
        <ReviewMap sighting={s} masts={mapMasts} radiusM={radiusM} selectedMastId={mastId} onSelectMast={setMastId} />
      </div>

      {s.photos.length > 0 && (
        <section aria-label="Photos">
          <h3>Photos</h3>
          <ul className="mt-2 grid grid-cols-3 gap-2 sm:grid-cols-6">
            {s.photos.map((p, i) => (
              <li key={p.id}>
                <a href={p.display_url} target="_blank" rel="noreferrer" className="block overflow-hidden rounded border border-ink-200">
                  <img src={p.thumb_url} alt={`Photo ${i + 1} of ${s.photos.length}`} className="aspect-square w-full object-cover" loading="lazy" />
                </a>
                {p.original_url && (
                  <a href={p.original_url} className="text-xs text-ink-600 underline" target="_blank" rel="noreferrer">
                    original
                  </a>
                )}
              </li>
            ))}
          </ul>
        </section>
      )}

      <section aria-labelledby={`dups-${s.id}`}>
        <h3 id={`dups-${s.id}`}>Masts within {radiusM} m</h3>
        {item.candidates.length === 0 ? (
          <p className="text-sm text-ink-600">None: this looks like a mast we do not have yet.</p>
        ) : (
          <ol className="mt-2 space-y-1.5" data-testid="duplicate-candidates">
            {item.candidates.map((c, i) => (
              <li key={c.mast.id}>
                <button
                  type="button"
                  aria-pressed={c.mast.id === mastId}
                  onClick={() => setMastId(c.mast.id)}
                  className={`flex min-h-11 w-full items-center gap-3 rounded-md border px-3 py-2 text-left text-sm ${c.mast.id === mastId ? 'border-ink-700 bg-ink-50' : 'border-ink-200 hover:bg-ink-50'}`}
                >
                  <span className="flex h-6 w-6 shrink-0 items-center justify-center rounded-full bg-ink-600 text-xs font-bold text-white">{i + 1}</span>
                  <span className="min-w-0 flex-1">
                    <span className="block truncate font-semibold">{c.mast.name}</span>
                    <span className="text-ink-600">
                      {fmtDistance(c.distance_m)} away · {count(c.cells.length, 'cell')}
                    </span>
                  </span>
                  <span
                    className={`shrink-0 rounded px-2 py-0.5 text-xs font-semibold ${c.shared_cells ? 'bg-moss-100 text-moss-700' : 'bg-ink-100 text-ink-600'}`}
                  >
                    {c.shared_cells} shared
                  </span>
                </button>
              </li>
            ))}
          </ol>
        )}
      </section>

      <section aria-label="Cells">
        <h3 className="mb-2">Cells{candidate ? ` beside ${candidate.mast.name}` : ''}</h3>
        <div className="overflow-x-auto">
          <CellsSideBySide sightingCells={s.cells} mastCells={candidate?.cells ?? null} mastName={candidate?.mast.name ?? null} />
        </div>
      </section>

      <DecisionForm item={item} candidate={candidate} onDecided={onDecided} onStale={onStale} />
    </article>
  );
}

/** Pending sightings oldest first; the chosen one with its map, photos, possible duplicates and the decision. */
export default function ReviewQueue() {
  const queue = useQuery('queue', () => reviewApi.queue({ limit: 50 }), { failed: 'Could not load the queue' });
  const data = queue.data;
  const [chosen, setChosen] = useState<string | null>(null);
  const [notice, setNotice] = useState<{ text: string; tone: 'ok' | 'warn' } | null>(null);
  // The sighting chosen while it waits, else the oldest (after a decision the decided one is gone).
  const item = data?.items.find((i) => i.sighting.id === chosen) ?? data?.items[0] ?? null;
  const selected = item?.sighting.id ?? null;

  function decided(message: string) {
    setNotice({ text: message, tone: 'ok' });
    queue.refetch();
    document.getElementById('review-notice')?.focus();
  }

  function stale(message: string) {
    setNotice({ text: message, tone: 'warn' });
    queue.refetch();
  }

  if (queue.error)
    return (
      <p role="alert" className="mt-4 text-alarm-700">
        {queue.error.message}
      </p>
    );
  if (!data) return <p className="mt-4 text-ink-500">Loading the queue…</p>;

  return (
    <div className="mt-4 space-y-4">
      <p
        id="review-notice"
        tabIndex={-1}
        aria-live="polite"
        data-testid="review-notice"
        className={
          notice
            ? `rounded-md border px-3 py-2 text-sm ${notice.tone === 'ok' ? 'border-moss-100 bg-moss-50 text-moss-700' : 'border-ember-100 bg-ember-50 text-ember-700'}`
            : 'sr-only'
        }
      >
        {notice?.text}
        {notice?.tone === 'ok' && (
          <>
            {' '}
            <a href="/map" className="font-semibold underline">
              Open the map
            </a>
          </>
        )}
      </p>
      {data.items.length === 0 ? (
        <p className="card text-ink-600" data-testid="review-empty">
          No sightings wait for review. New ones appear here, oldest first.
        </p>
      ) : (
        <div className="grid gap-4 lg:grid-cols-[minmax(0,22rem)_minmax(0,1fr)]">
          <section className="card min-w-0" aria-labelledby="queue-heading">
            <h2 id="queue-heading">
              {data.total} waiting <span className="text-sm font-normal text-ink-500">oldest first</span>
            </h2>
            <ul className="mt-2 divide-y divide-ink-100" data-testid="review-queue">
              {data.items.map((i) => {
                const best = i.candidates[0];
                return (
                  <li key={i.sighting.id}>
                    <button
                      type="button"
                      data-testid={`queue-item-${i.sighting.id}`}
                      aria-current={i.sighting.id === selected ? 'true' : undefined}
                      onClick={() => setChosen(i.sighting.id)}
                      className={`flex min-h-11 w-full flex-col gap-0.5 rounded px-2 py-2 text-left text-sm ${i.sighting.id === selected ? 'bg-ink-100' : 'hover:bg-ink-50'}`}
                    >
                      <span className="flex justify-between gap-2">
                        <span className="font-semibold">{STRUCTURE_TYPE_LABELS[i.sighting.structure_type]}</span>
                        <span className="text-ink-500">{fmtDate(i.sighting.created_at)}</span>
                      </span>
                      <span className="text-ink-700">
                        {i.sighting.author.name} · <SubmitterRecord r={i.submitter} />
                      </span>
                      <span className="text-xs text-ink-600">
                        {count(i.sighting.cells.length, 'cell')} · {count(i.sighting.photos.length, 'photo')} ·{' '}
                        {best
                          ? `${i.candidates.length} mast${i.candidates.length === 1 ? '' : 's'} near, ${best.shared_cells} shared at ${fmtDistance(best.distance_m)}`
                          : 'no mast near'}
                      </span>
                    </button>
                  </li>
                );
              })}
            </ul>
            {data.total > data.items.length && <p className="mt-2 text-xs text-ink-500">Showing the oldest {data.items.length}; decide these to see more.</p>}
          </section>
          {item && <SightingDetail key={item.sighting.id} item={item} radiusM={data.radius_m} onDecided={decided} onStale={stale} />}
        </div>
      )}
    </div>
  );
}
