// Who surveyed a mast, when it was last observed, and the photos of its approved sightings.
import { useQuery } from '../ui/use-api';
import { sightingsApi } from '../../lib/client/sightings-api';
import type { MastSurveyJson } from '../../lib/schemas/sightings';
import { formatDate } from '../../lib/domain/format';

const fmtDate = formatDate;

export default function MastSurveys({ mastId }: { mastId: string }) {
  const query = useQuery<MastSurveyJson>(mastId, () => sightingsApi.mastSurveys(mastId), { keepOnError: false });
  // Another mast's surveys stay out of sight while this one's load.
  const surveys = query.loading ? null : query.data;
  const failed = !!query.error;

  return (
    <section aria-labelledby="mast-surveys-heading" data-testid="mast-surveys">
      <h3 id="mast-surveys-heading" className="mb-1.5 font-semibold text-ink-800">
        Surveys
      </h3>
      {failed && <p className="text-ink-500">Surveys could not be loaded.</p>}
      {!failed && !surveys && <p className="text-ink-500">Loading…</p>}
      {surveys && surveys.surveyors.length === 0 && <p className="text-ink-500">No field sightings of this mast yet.</p>}
      {surveys && surveys.surveyors.length > 0 && (
        <>
          <p className="text-sm text-ink-800">
            Last observed <strong>{fmtDate(surveys.last_observed_at!)}</strong>
          </p>
          <p className="text-sm text-ink-700">Surveyed by {surveys.surveyors.map((s) => `${s.name} (${fmtDate(s.last_observed_at)})`).join(', ')}</p>
          {surveys.photos.length > 0 && (
            <ul className="mt-2 grid grid-cols-3 gap-2" aria-label="Photos of the mast">
              {surveys.photos.map((p) => (
                <li key={p.id}>
                  <a href={p.display_url} target="_blank" rel="noreferrer">
                    <img
                      src={p.thumb_url}
                      alt={`Photo from a sighting${p.taken_at ? ` taken ${fmtDate(p.taken_at)}` : ''}`}
                      loading="lazy"
                      className="aspect-square w-full rounded object-cover"
                    />
                  </a>
                  {p.original_url && (
                    <a href={p.original_url} target="_blank" rel="noreferrer" className="text-xs text-ink-600 underline">
                      Original
                    </a>
                  )}
                </li>
              ))}
            </ul>
          )}
        </>
      )}
    </section>
  );
}
