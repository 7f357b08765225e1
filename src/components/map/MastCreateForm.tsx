import { useEffect, useRef, useState, type FormEvent } from 'react';
import { checkWith } from '../../lib/client/api';
import { mastsApi } from '../../lib/client/masts-api';
import type { MastJson } from '../../lib/schemas/masts';
import { elevationApi } from '../../lib/client/elevation-api';
import { MastInputSchema } from '../../lib/schemas/masts';
import { FormActions, FormAlert } from './form-parts';
import { mastInputOf, newMastDraft, readNumber, type MastDraft } from './mast-form';
import MastFormFields from './MastFormFields';
import PanelFrame from './PanelFrame';
import { useQuery } from '../ui/use-api';
import { useMapForm } from './use-map-form';

export interface LatLon {
  lat: number;
  lon: number;
}

interface Props {
  /** Where the new mast is marked on the map (a click, or the marker dragged). */
  position: LatLon;
  /** Typed coordinates move the marker. */
  onPositionChange: (position: LatLon) => void;
  onCreated: (mast: MastJson) => void;
  onCancel: () => void;
}

const near = (a: number, b: number) => Math.abs(a - b) < 5e-7;

/** Where the ground field's value came from: the elevation data at the marker, or the person typing. */
type GroundSource = 'data' | 'typed' | 'none';

/** Adds a mast where the map was clicked, with the API's checks before sending and its answers beside the fields. */
export default function MastCreateForm({ position, onPositionChange, onCreated, onCancel }: Props) {
  const [draft, setDraft] = useState<MastDraft>(() => newMastDraft(position.lat, position.lon));
  const form = useMapForm('Could not add the mast');
  const [ground, setGround] = useState<{ source: GroundSource; note: string | null }>({ source: 'none', note: null });
  const headingRef = useRef<HTMLHeadingElement>(null);

  useEffect(() => headingRef.current?.focus(), []);

  // The ground height under the marker from the imported elevation data, each time it moves, unless
  // a height was typed in: that one is kept.
  const typedGround = ground.source === 'typed';
  useQuery(typedGround ? null : `${position.lat},${position.lon}`, () => elevationApi.sample(position.lat, position.lon), {
    onSuccess: (s) => {
      const known = s.height_m !== null;
      setDraft((d) => ({ ...d, ground_elevation_m: known ? String(Math.round(s.height_m! * 10) / 10) : '' }));
      setGround({ source: known ? 'data' : 'none', note: known ? 'From the elevation data' : 'No elevation data here' });
    },
  });

  // A new click or a dragged marker moves the position; typed coordinates already there are kept.
  useEffect(() => {
    setDraft((d) =>
      near(Number(d.lat), position.lat) && near(Number(d.lon), position.lon) ? d : { ...d, lat: position.lat.toFixed(6), lon: position.lon.toFixed(6) },
    );
  }, [position.lat, position.lon]);

  useEffect(() => {
    const onKey = (e: KeyboardEvent) => e.key === 'Escape' && !(e.target instanceof HTMLElement && e.target.closest('form')) && onCancel();
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  }, [onCancel]);

  function change(key: keyof MastDraft, value: string) {
    const next = { ...draft, [key]: value } as MastDraft;
    setDraft(next);
    form.clear(key === 'lat' || key === 'lon' ? ['lat', 'lon'] : [key]);
    // A blank ground height goes back to the elevation data.
    if (key === 'ground_elevation_m') setGround({ source: value.trim() === '' ? 'none' : 'typed', note: null });
    if (key !== 'lat' && key !== 'lon') return;
    const lat = readNumber(next.lat, false);
    const lon = readNumber(next.lon, false);
    if (typeof lat === 'number' && typeof lon === 'number' && Math.abs(lat) <= 90 && Math.abs(lon) <= 180) onPositionChange({ lat, lon });
  }

  async function submit(e: FormEvent) {
    e.preventDefault();
    const body = mastInputOf(draft);
    const sent = await form.submit(() => mastsApi.create(body), { check: () => checkWith(MastInputSchema, body) });
    if (sent.ok) onCreated(sent.data);
  }

  return (
    <PanelFrame
      labelledBy="new-mast-heading"
      testId="new-mast-panel"
      closeLabel="Cancel the new mast"
      onClose={onCancel}
      header={
        <div className="min-w-0 flex-1">
          <h2 id="new-mast-heading" ref={headingRef} tabIndex={-1} className="text-lg focus:outline-none focus-visible:ring-0 focus-visible:ring-offset-0">
            New mast
          </h2>
          <p className="mt-0.5 text-xs text-ink-600">Click the map or drag the marker to move it, or type the position.</p>
        </div>
      }
    >
      <form onSubmit={submit} noValidate className="space-y-3" aria-labelledby="new-mast-heading" data-testid="new-mast-form">
        <FormAlert message={form.message} errors={form.errors._} />
        <MastFormFields prefix="new-mast" draft={draft} errors={form.errors} onChange={change} hints={{ ground_elevation_m: ground.note }} />
        <FormActions submitLabel="Add mast" busy={form.pending} onCancel={onCancel} />
      </form>
    </PanelFrame>
  );
}
