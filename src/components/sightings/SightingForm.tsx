// The surveyor's sighting form, phone first: one column, large targets, works with no signal (the
// sighting is kept on the device and sent when the connection returns).
import { lazy, Suspense, useEffect, useMemo, useState } from 'react';
import exifr from 'exifr';
import { operatorsApi } from '../../lib/client/operators-api';
import { flushOutbox, keepFlushing, saveToOutbox } from '../../lib/client/sighting-outbox';
import { IMAGE_SNIFF_BYTES, sniffImageType } from '../../lib/domain/image-type';
import { TECHS, type Tech } from '../../lib/schemas/mast-enums';
import {
  MAX_PHOTO_BYTES,
  MAX_SIGHTING_PHOTOS,
  SIGHTING_STRUCTURE_LABELS as STRUCTURE_LABELS,
  SIGHTING_STRUCTURE_TYPES,
  SightingInputSchema,
  getReadingRange,
  type PositionSource,
  type SightingInputJson,
  type SightingStructureType,
} from '../../lib/schemas/sightings';
import OutboxList from './OutboxList';
import type { LatLon } from './PositionMap';
import { ChoiceOptions, Field, FieldErrorText, fieldAria } from '../ui/field';
import { OperatorOptions } from '../map/form-parts';
import { useQuery } from '../ui/use-api';

const PositionMap = lazy(() => import('./PositionMap'));

const TECH_LABELS: Record<Tech, string> = { gsm: 'GSM (2G)', umts: 'UMTS (3G)', lte: 'LTE (4G)', nr: 'NR (5G)' };
const SOURCE_LABELS: Record<PositionSource, string> = { photo: "from the photo's GPS", device: 'from this device', map: 'from the map' };

interface CellDraft {
  key: number;
  operator_id: string;
  tech: Tech;
  channel: string;
  band: string;
  pci: string;
  sector_azimuth_deg: string;
  rsrp_dbm: string;
  rsrq_db: string;
  sinr_db: string;
}

interface PhotoDraft {
  key: number;
  file: File;
  url: string;
  gps: LatLon | null;
}

type Errors = Record<string, string>;

let keys = 0;
const newCell = (operatorId = ''): CellDraft => ({
  key: ++keys,
  operator_id: operatorId,
  tech: 'lte',
  channel: '',
  band: '',
  pci: '',
  sector_azimuth_deg: '',
  rsrp_dbm: '',
  rsrq_db: '',
  sinr_db: '',
});

/** A number typed in a field, or undefined when blank (NaN stays, for the schema to name). */
const numberOrBlank = (s: string): number | undefined => (s.trim() === '' ? undefined : Number(s.replace(',', '.')));

function localNow(): string {
  const d = new Date();
  d.setSeconds(0, 0);
  return new Date(d.getTime() - d.getTimezoneOffset() * 60_000).toISOString().slice(0, 16);
}

async function readGps(file: File): Promise<LatLon | null> {
  try {
    const gps = await exifr.gps(file);
    return gps && Number.isFinite(gps.latitude) && Number.isFinite(gps.longitude) ? { lat: gps.latitude, lon: gps.longitude } : null;
  } catch {
    return null;
  }
}

const INPUT = 'field-input min-h-12 text-base';
const BIG_BUTTON = 'min-h-12 w-full text-base';

export default function SightingForm({ fallbackCenter }: { fallbackCenter: LatLon }) {
  // Without a connection the list stays empty and the form still works.
  const operators = useQuery('operators', () => operatorsApi.list()).data?.items ?? [];
  const [lat, setLat] = useState('');
  const [lon, setLon] = useState('');
  const [source, setSource] = useState<PositionSource>('map');
  const [accuracy, setAccuracy] = useState<number | null>(null);
  const [locating, setLocating] = useState(false);
  const [structure, setStructure] = useState<SightingStructureType | ''>('');
  const [height, setHeight] = useState('');
  const [seen, setSeen] = useState<string[]>([]);
  const [cells, setCells] = useState<CellDraft[]>([]);
  const [notes, setNotes] = useState('');
  const [observedAt, setObservedAt] = useState(localNow);
  const [photos, setPhotos] = useState<PhotoDraft[]>([]);
  const [errors, setErrors] = useState<Errors>({});
  const [notice, setNotice] = useState<{ tone: 'ok' | 'wait' | 'bad'; text: string } | null>(null);
  const [busy, setBusy] = useState(false);

  useEffect(() => keepFlushing(), []);

  const position = useMemo<LatLon | null>(() => {
    const a = Number(lat);
    const b = Number(lon);
    return lat.trim() && lon.trim() && Number.isFinite(a) && Number.isFinite(b) && Math.abs(a) <= 90 && Math.abs(b) <= 180 ? { lat: a, lon: b } : null;
  }, [lat, lon]);

  function setPosition(p: LatLon, from: PositionSource, acc: number | null = null) {
    setLat(p.lat.toFixed(6));
    setLon(p.lon.toFixed(6));
    setSource(from);
    setAccuracy(acc);
    setErrors((e) => ({ ...e, lat: '', lon: '', position_source: '' }));
  }

  function useDevice() {
    if (!('geolocation' in navigator)) {
      setErrors((e) => ({ ...e, lat: 'This device cannot tell its position: use a photo or the map' }));
      return;
    }
    setLocating(true);
    navigator.geolocation.getCurrentPosition(
      (p) => {
        setLocating(false);
        setPosition({ lat: p.coords.latitude, lon: p.coords.longitude }, 'device', p.coords.accuracy);
      },
      (err) => {
        setLocating(false);
        setErrors((e) => ({
          ...e,
          lat:
            err.code === err.PERMISSION_DENIED
              ? 'Location is blocked for this site: allow it, or use a photo or the map'
              : 'No position from the device yet: try again in the open, or use the map',
        }));
      },
      { enableHighAccuracy: true, timeout: 20_000, maximumAge: 30_000 },
    );
  }

  async function addPhotos(files: FileList | null) {
    if (!files) return;
    const added: PhotoDraft[] = [];
    const problems: string[] = [];
    for (const file of Array.from(files)) {
      if (photos.length + added.length >= MAX_SIGHTING_PHOTOS) {
        problems.push(`At most ${MAX_SIGHTING_PHOTOS} photos`);
        break;
      }
      if (file.size > MAX_PHOTO_BYTES) {
        problems.push(`${file.name} is larger than ${MAX_PHOTO_BYTES / (1024 * 1024)} MB`);
        continue;
      }
      const head = new Uint8Array(await file.slice(0, IMAGE_SNIFF_BYTES).arrayBuffer());
      if (!sniffImageType(head)) {
        problems.push(`${file.name} is not a JPEG, PNG or WebP photo`);
        continue;
      }
      added.push({ key: ++keys, file, url: URL.createObjectURL(file), gps: await readGps(file) });
    }
    setPhotos((p) => [...p, ...added]);
    setErrors((e) => ({ ...e, photos: problems.join('. ') }));
    const tagged = added.find((p) => p.gps);
    if (tagged && (!position || source === 'photo')) setPosition(tagged.gps!, 'photo');
  }

  function removePhoto(key: number) {
    setPhotos((list) => {
      const gone = list.find((p) => p.key === key);
      if (gone) URL.revokeObjectURL(gone.url);
      return list.filter((p) => p.key !== key);
    });
  }

  function updateCell(key: number, change: Partial<CellDraft>) {
    setCells((list) => list.map((c) => (c.key === key ? { ...c, ...change } : c)));
  }

  function toggleOperator(id: string) {
    setSeen((s) => (s.includes(id) ? s.filter((x) => x !== id) : [...s, id]));
  }

  function buildInput(clientUuid: string): SightingInputJson {
    return {
      client_uuid: clientUuid,
      lat: numberOrBlank(lat) as number,
      lon: numberOrBlank(lon) as number,
      position_source: source,
      position_accuracy_m: source === 'device' ? accuracy : null,
      structure_type: (structure || undefined) as SightingStructureType,
      estimated_height_m: numberOrBlank(height) ?? null,
      operator_ids: seen,
      cells: cells.map((c) => ({
        operator_id: c.operator_id,
        tech: c.tech,
        channel: numberOrBlank(c.channel) as number,
        band: c.band.trim() || null,
        pci: numberOrBlank(c.pci) ?? null,
        sector_azimuth_deg: numberOrBlank(c.sector_azimuth_deg) ?? null,
        rsrp_dbm: numberOrBlank(c.rsrp_dbm) ?? null,
        rsrq_db: numberOrBlank(c.rsrq_db) ?? null,
        sinr_db: numberOrBlank(c.sinr_db) ?? null,
      })),
      notes: notes.trim() || null,
      // Sent as JSON text; the schema reads it back as a date.
      observed_at: (observedAt ? new Date(observedAt).toISOString() : '') as unknown as Date,
    };
  }

  function reset() {
    for (const p of photos) URL.revokeObjectURL(p.url);
    setLat('');
    setLon('');
    setSource('map');
    setAccuracy(null);
    setStructure('');
    setHeight('');
    setSeen([]);
    setCells([]);
    setNotes('');
    setObservedAt(localNow());
    setPhotos([]);
  }

  async function submit(e: React.FormEvent) {
    e.preventDefault();
    setNotice(null);
    const input = buildInput(crypto.randomUUID());
    const parsed = SightingInputSchema.safeParse(input);
    const found: Errors = {};
    if (!parsed.success) {
      for (const issue of parsed.error.issues) {
        const key = issue.path.join('.') || '_';
        found[key] ??= issue.message === 'Required' && key === 'structure_type' ? 'Choose the kind of structure' : issue.message;
      }
    }
    if (source === 'photo' && !photos.some((p) => p.gps)) found.position_source = 'None of the photos carries a GPS position: use the device or the map';
    if (Object.keys(found).length) {
      setErrors(found);
      const first = document.querySelector<HTMLElement>('[aria-invalid="true"]');
      first?.focus();
      setNotice({ tone: 'bad', text: 'Some fields need attention (marked below).' });
      return;
    }
    setErrors({});
    setBusy(true);
    try {
      await saveToOutbox({
        clientUuid: input.client_uuid,
        sighting: input,
        photos: photos.map((p) => ({ name: p.file.name, blob: p.file })),
        savedAt: new Date().toISOString(),
        state: 'waiting',
      });
      reset();
      const results = navigator.onLine ? await flushOutbox() : [];
      const mine = results.find((r) => r.clientUuid === input.client_uuid);
      if (mine?.outcome === 'sent') setNotice({ tone: 'ok', text: 'Sent. It shows as pending on the map until a reviewer decides.' });
      else if (mine?.outcome === 'refused') setNotice({ tone: 'bad', text: `The server refused it: ${mine.message}` });
      else setNotice({ tone: 'wait', text: 'Saved on this device: waiting to send. It goes as soon as there is a connection.' });
    } catch {
      setNotice({ tone: 'bad', text: 'This device could not keep the sighting (storage full or blocked). Nothing was sent.' });
    } finally {
      setBusy(false);
      window.scrollTo({ top: 0, behavior: 'smooth' });
    }
  }

  /** A field's frame: its id, label, hint, and the message for `key` (the schema's name for it). */
  const frame = (id: string, key: string, label: string, hint?: string) => ({ id, label, hint, errors: errors[key] ? [errors[key]] : undefined });
  const field = {
    structure: frame('structure_type', 'structure_type', 'Kind of structure'),
    lat: frame('lat', 'lat', 'Latitude'),
    lon: frame('lon', 'lon', 'Longitude'),
    height: frame('height', 'estimated_height_m', 'Estimated height (m)', 'A guess is fine: a storey is about 3 m.'),
    observedAt: frame('observed_at', 'observed_at', 'Seen at'),
    notes: frame('notes', 'notes', 'Notes (optional)', 'Access, landmarks, anything a reviewer should know. No personal details.'),
  };

  return (
    <div className="mx-auto max-w-xl space-y-5">
      {notice && (
        <div
          role="status"
          className={`rounded-md border p-3 text-base ${notice.tone === 'ok' ? 'border-moss-500 bg-moss-50 text-moss-700' : notice.tone === 'wait' ? 'border-ember-500 bg-ember-50 text-ember-700' : 'border-alarm-500 bg-alarm-50 text-alarm-700'}`}
        >
          {notice.text}
        </div>
      )}
      <OutboxList />

      <form onSubmit={submit} noValidate className="space-y-5" aria-label="New sighting">
        <section className="card space-y-3">
          <h2>Where is it?</h2>
          <p className="text-sm text-ink-600">Stand where you can see the mast safely; never climb or enter a fenced compound.</p>
          <div className="grid grid-cols-1 gap-2">
            <button type="button" className={`btn-secondary ${BIG_BUTTON}`} onClick={useDevice} disabled={locating}>
              {locating ? 'Finding your position…' : 'Use my location'}
            </button>
            <label className={`btn-secondary ${BIG_BUTTON} cursor-pointer`}>
              Take or choose photos
              <input
                type="file"
                accept="image/jpeg,image/png,image/webp"
                multiple
                className="sr-only"
                data-testid="photo-input"
                onChange={(e) => {
                  addPhotos(e.target.files);
                  e.target.value = '';
                }}
              />
            </label>
          </div>
          {errors.photos && (
            <p className="field-error" role="alert">
              {errors.photos}
            </p>
          )}
          {photos.length > 0 && (
            <ul className="grid grid-cols-3 gap-2" aria-label="Photos">
              {photos.map((p, i) => (
                <li key={p.key} className="relative">
                  <img src={p.url} alt={`Photo ${i + 1}`} className="aspect-square w-full rounded-md object-cover" />
                  <div className="mt-1 flex flex-col items-start gap-1 text-xs">
                    {p.gps ? (
                      <button type="button" className="text-ink-700 underline" onClick={() => setPosition(p.gps!, 'photo')}>
                        Use its GPS
                      </button>
                    ) : (
                      <span className="text-ink-500">No GPS</span>
                    )}
                    <button
                      type="button"
                      className="min-h-8 px-2 text-alarm-700 underline"
                      onClick={() => removePhoto(p.key)}
                      aria-label={`Remove photo ${i + 1}`}
                    >
                      Remove
                    </button>
                  </div>
                </li>
              ))}
            </ul>
          )}
          <div className="h-56 overflow-hidden rounded-md border border-ink-200" data-testid="position-map">
            <Suspense fallback={<div className="flex h-full items-center justify-center bg-ink-100 text-sm text-ink-600">Loading the map…</div>}>
              <PositionMap position={position} fallbackCenter={fallbackCenter} onPick={(p) => setPosition(p, 'map')} />
            </Suspense>
          </div>
          <p className="text-xs text-ink-600">
            Tap the map to place the marker; drag it to correct. Without a connection the map may stay blank: type the position instead.
          </p>
          <div className="grid grid-cols-2 gap-3">
            <Field {...field.lat}>
              <input
                {...fieldAria(field.lat)}
                className={INPUT}
                inputMode="decimal"
                value={lat}
                onChange={(e) => {
                  setLat(e.target.value);
                  setSource('map');
                  setAccuracy(null);
                }}
                placeholder="-47.21"
              />
            </Field>
            <Field {...field.lon}>
              <input
                {...fieldAria(field.lon)}
                className={INPUT}
                inputMode="decimal"
                value={lon}
                onChange={(e) => {
                  setLon(e.target.value);
                  setSource('map');
                  setAccuracy(null);
                }}
                placeholder="-128.49"
              />
            </Field>
          </div>
          <p className="text-sm text-ink-700" data-testid="position-source">
            {position ? (
              <>
                Position {SOURCE_LABELS[source]}
                {source === 'device' && accuracy !== null && <> · accuracy ±{Math.round(accuracy)} m</>}
              </>
            ) : (
              'No position yet.'
            )}
          </p>
          {errors.position_source && (
            <p className="field-error" role="alert">
              {errors.position_source}
            </p>
          )}
        </section>

        <section className="card space-y-4">
          <h2>The structure</h2>
          <fieldset>
            <legend className="field-label">Kind of structure</legend>
            <div className="grid grid-cols-2 gap-2" role="radiogroup" {...fieldAria(field.structure)}>
              {SIGHTING_STRUCTURE_TYPES.map((t) => (
                <label
                  key={t}
                  className={`flex min-h-12 cursor-pointer items-center gap-2 rounded-md border px-3 text-base ${structure === t ? 'border-ink-700 bg-ink-100 font-semibold' : 'border-ink-300 bg-white'}`}
                >
                  <input type="radio" name="structure_type" value={t} checked={structure === t} onChange={() => setStructure(t)} className="h-5 w-5" />
                  {STRUCTURE_LABELS[t]}
                </label>
              ))}
            </div>
            <FieldErrorText id={field.structure.id} errors={field.structure.errors} />
          </fieldset>
          <Field {...field.height}>
            <input {...fieldAria(field.height)} className={INPUT} inputMode="decimal" value={height} onChange={(e) => setHeight(e.target.value)} />
          </Field>
          <fieldset>
            <legend className="field-label">Operators seen (signs, equipment, the phone&apos;s network list)</legend>
            {operators.length === 0 && <p className="text-sm text-ink-600">The operator list loads with a connection.</p>}
            <div className="flex flex-wrap gap-2">
              {operators.map((o) => (
                <label
                  key={o.id}
                  className={`flex min-h-12 cursor-pointer items-center gap-2 rounded-full border px-4 text-base ${seen.includes(o.id) ? 'border-ink-700 bg-ink-100' : 'border-ink-300 bg-white'}`}
                >
                  <input type="checkbox" checked={seen.includes(o.id)} onChange={() => toggleOperator(o.id)} className="h-5 w-5" />
                  <span className="inline-block h-3 w-3 rounded-full" style={{ background: o.colour }} aria-hidden="true" />
                  {o.name}
                </label>
              ))}
            </div>
          </fieldset>
        </section>

        <section className="card space-y-4">
          <h2>Cells seen</h2>
          <p className="text-sm text-ink-600">From the phone&apos;s field-test screen or a survey app, standing where you are now.</p>
          {cells.map((c, i) => {
            const ranges = { rsrp: getReadingRange(c.tech, 'rsrp'), rsrq: getReadingRange(c.tech, 'rsrq'), sinr: getReadingRange(c.tech, 'sinr') };
            const id = (f: string) => `cell-${i}-${f}`;
            const rangeHint = (r: { min: number; max: number; unit: string } | null) => (r ? `${r.min} … ${r.max} ${r.unit}` : undefined);
            const cell = {
              operator: frame(id('operator'), `cells.${i}.operator_id`, 'Operator'),
              tech: frame(id('tech'), `cells.${i}.tech`, 'Technology'),
              channel: frame(
                id('channel'),
                `cells.${i}.channel`,
                c.tech === 'nr' ? 'NR-ARFCN' : c.tech === 'lte' ? 'EARFCN' : c.tech === 'umts' ? 'UARFCN' : 'ARFCN',
              ),
              band: frame(id('band'), `cells.${i}.band`, 'Band (optional)'),
              pci: frame(id('pci'), `cells.${i}.pci`, c.tech === 'umts' ? 'PSC' : 'PCI'),
              azimuth: frame(id('azimuth'), `cells.${i}.sector_azimuth_deg`, 'Sector azimuth (°)', 'If known'),
              rsrp: frame(id('rsrp'), `cells.${i}.rsrp_dbm`, 'RSRP', rangeHint(ranges.rsrp)),
              rsrq: frame(id('rsrq'), `cells.${i}.rsrq_db`, 'RSRQ', rangeHint(ranges.rsrq)),
              sinr: frame(id('sinr'), `cells.${i}.sinr_db`, 'SINR', rangeHint(ranges.sinr)),
            };
            return (
              <fieldset key={c.key} className="space-y-3 rounded-md border border-ink-200 p-3" aria-label={`Cell ${i + 1}`}>
                <div className="flex items-center justify-between">
                  <legend className="font-semibold text-ink-800">Cell {i + 1}</legend>
                  <button
                    type="button"
                    className="min-h-10 px-2 text-sm text-alarm-700 underline"
                    onClick={() => setCells((l) => l.filter((x) => x.key !== c.key))}
                  >
                    Remove cell {i + 1}
                  </button>
                </div>
                <Field {...cell.operator}>
                  <select
                    {...fieldAria(cell.operator)}
                    className={INPUT}
                    value={c.operator_id}
                    onChange={(e) => updateCell(c.key, { operator_id: e.target.value })}
                  >
                    <option value="">Choose…</option>
                    <OperatorOptions operators={operators} />
                  </select>
                </Field>
                <Field {...cell.tech}>
                  <select {...fieldAria(cell.tech)} className={INPUT} value={c.tech} onChange={(e) => updateCell(c.key, { tech: e.target.value as Tech })}>
                    <ChoiceOptions values={TECHS} labels={TECH_LABELS} />
                  </select>
                </Field>
                <div className="grid grid-cols-2 gap-3">
                  <Field {...cell.channel}>
                    <input
                      {...fieldAria(cell.channel)}
                      className={INPUT}
                      inputMode="numeric"
                      value={c.channel}
                      onChange={(e) => updateCell(c.key, { channel: e.target.value })}
                    />
                  </Field>
                  <Field {...cell.band}>
                    <input
                      {...fieldAria(cell.band)}
                      className={INPUT}
                      value={c.band}
                      placeholder={c.tech === 'nr' ? 'n78' : 'B20'}
                      onChange={(e) => updateCell(c.key, { band: e.target.value })}
                    />
                  </Field>
                  <Field {...cell.pci}>
                    <input
                      {...fieldAria(cell.pci)}
                      className={INPUT}
                      inputMode="numeric"
                      value={c.pci}
                      disabled={c.tech === 'gsm'}
                      onChange={(e) => updateCell(c.key, { pci: e.target.value })}
                    />
                  </Field>
                  <Field {...cell.azimuth}>
                    <input
                      {...fieldAria(cell.azimuth)}
                      className={INPUT}
                      inputMode="decimal"
                      value={c.sector_azimuth_deg}
                      onChange={(e) => updateCell(c.key, { sector_azimuth_deg: e.target.value })}
                    />
                  </Field>
                </div>
                {ranges.rsrp && (
                  <div className="grid grid-cols-3 gap-2">
                    <Field {...cell.rsrp}>
                      <input
                        {...fieldAria(cell.rsrp)}
                        className={INPUT}
                        inputMode="decimal"
                        value={c.rsrp_dbm}
                        onChange={(e) => updateCell(c.key, { rsrp_dbm: e.target.value })}
                      />
                    </Field>
                    <Field {...cell.rsrq}>
                      <input
                        {...fieldAria(cell.rsrq)}
                        className={INPUT}
                        inputMode="decimal"
                        value={c.rsrq_db}
                        onChange={(e) => updateCell(c.key, { rsrq_db: e.target.value })}
                      />
                    </Field>
                    <Field {...cell.sinr}>
                      <input
                        {...fieldAria(cell.sinr)}
                        className={INPUT}
                        inputMode="decimal"
                        value={c.sinr_db}
                        onChange={(e) => updateCell(c.key, { sinr_db: e.target.value })}
                      />
                    </Field>
                  </div>
                )}
              </fieldset>
            );
          })}
          <button type="button" className={`btn-secondary ${BIG_BUTTON}`} onClick={() => setCells((l) => [...l, newCell(seen[0] ?? '')])}>
            Add a cell
          </button>
        </section>

        <section className="card space-y-4">
          <h2>Notes</h2>
          <Field {...field.observedAt}>
            <input
              {...fieldAria(field.observedAt)}
              type="datetime-local"
              className={INPUT}
              value={observedAt}
              onChange={(e) => setObservedAt(e.target.value)}
            />
          </Field>
          <Field {...field.notes}>
            <textarea
              {...fieldAria(field.notes)}
              className="field-input min-h-24 text-base"
              value={notes}
              onChange={(e) => setNotes(e.target.value)}
              maxLength={2000}
            />
          </Field>
        </section>

        {errors._ && (
          <p className="field-error" role="alert">
            {errors._}
          </p>
        )}
        <button type="submit" className={`btn-primary ${BIG_BUTTON}`} disabled={busy}>
          {busy ? 'Saving…' : 'Submit sighting'}
        </button>
      </form>
    </div>
  );
}
