import { useEffect, useMemo, useRef, useState, type FormEvent } from 'react';
import { ApiError, regionsApi, type FieldErrors, type RegionJson } from '../../lib/client/api';
import { SortableTable, type Column } from '../ui/SortableTable';
import { formatArea, formatCount, formatDate } from '../../lib/domain/format';

type Rings = number[][][];

/** The outline thumbnails are a few dozen pixels: a zoom-6 simplification is plenty. */
const OUTLINE_PREVIEW_ZOOM = 6;

/** Outer and inner rings of a Polygon or MultiPolygon, if the value is one. */

function ringsOf(geometry: unknown): Rings | null {
  const g = geometry as { type?: string; coordinates?: unknown } | null;
  if (!g || !Array.isArray(g.coordinates)) return null;
  if (g.type === 'Polygon') return g.coordinates as Rings;
  if (g.type === 'MultiPolygon') return (g.coordinates as Rings[]).flat();
  return null;
}

/** A small outline drawing of a polygon, scaled for the latitude. */
function PolygonPreview({ geometry, size = 56 }: { geometry: unknown; size?: number }) {
  const path = useMemo(() => {
    const rings = ringsOf(geometry);
    if (!rings?.length) return null;
    const pts = rings.flat().filter((p) => Array.isArray(p) && Number.isFinite(p[0]) && Number.isFinite(p[1]));
    if (!pts.length) return null;
    const lats = pts.map((p) => p[1]);
    const k = Math.cos((((Math.min(...lats) + Math.max(...lats)) / 2) * Math.PI) / 180);
    const xs = pts.map((p) => p[0] * k);
    const ys = pts.map((p) => -p[1]);
    const [x0, x1, y0, y1] = [Math.min(...xs), Math.max(...xs), Math.min(...ys), Math.max(...ys)];
    const span = Math.max(x1 - x0, y1 - y0) || 1;
    const pad = 3;
    const scale = (size - pad * 2) / span;
    const ox = pad + (size - pad * 2 - (x1 - x0) * scale) / 2;
    const oy = pad + (size - pad * 2 - (y1 - y0) * scale) / 2;
    return rings
      .map(
        (ring) => ring.map((p, i) => `${i ? 'L' : 'M'}${(ox + (p[0] * k - x0) * scale).toFixed(1)},${(oy + (-p[1] - y0) * scale).toFixed(1)}`).join('') + 'Z',
      )
      .join('');
  }, [geometry, size]);
  if (!path) return <span className="inline-block rounded bg-ink-50" style={{ width: size, height: size }} aria-hidden="true" />;
  return (
    <svg width={size} height={size} viewBox={`0 0 ${size} ${size}`} aria-hidden="true" className="rounded bg-[#c9d9e3]">
      <path d={path} fill="#f5f2ea" stroke="#36516c" strokeWidth="1.2" fillRule="evenodd" />
    </svg>
  );
}

interface Candidate {
  label: string;
  name: string;
  geometry: unknown;
}

/** Polygon features found in a GeoJSON document: a bare geometry, a Feature or a FeatureCollection. */
function findCandidates(doc: unknown, fileName: string): Candidate[] {
  const base = fileName.replace(/\.(geo)?json$/i, '');
  const d = doc as { type?: string; features?: unknown[]; geometry?: unknown; properties?: Record<string, unknown> | null } | null;
  const fromFeature = (f: typeof d, i: number): Candidate | null => {
    if (!f || !ringsOf(f.geometry)) return null;
    const name = typeof f.properties?.name === 'string' && f.properties.name.trim() ? f.properties.name.trim() : i >= 0 ? `${base} ${i + 1}` : base;
    return { label: name, name, geometry: f.geometry };
  };
  if (!d || typeof d !== 'object') return [];
  if (d.type === 'FeatureCollection' && Array.isArray(d.features)) {
    const found = d.features.map((f, i) => fromFeature(f as typeof d, d.features!.length > 1 ? i : -1)).filter((c): c is Candidate => !!c);
    return found;
  }
  if (d.type === 'Feature') {
    const c = fromFeature(d, -1);
    return c ? [c] : [];
  }
  if (ringsOf(d)) return [{ label: base, name: base, geometry: d }];
  return [];
}

/** A GeoJSON file may hold several features and more than the one region sent: read up to 10 MB. */
const MAX_FILE_BYTES = 10 * 1024 * 1024;

export default function RegionsAdmin() {
  const [regions, setRegions] = useState<RegionJson[] | null>(null);
  const [loadError, setLoadError] = useState<string | null>(null);
  const [notice, setNotice] = useState<string | null>(null);
  const [candidates, setCandidates] = useState<Candidate[]>([]);
  const [choice, setChoice] = useState(0);
  const [name, setName] = useState('');
  const [fieldErrors, setFieldErrors] = useState<FieldErrors>({});
  const [formError, setFormError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const [confirming, setConfirming] = useState<string | null>(null);
  const fileRef = useRef<HTMLInputElement>(null);

  useEffect(() => {
    regionsApi.list(OUTLINE_PREVIEW_ZOOM).then(
      (r) => setRegions(r.items),
      (e: ApiError) => setLoadError(e.message),
    );
  }, []);

  const chosen = candidates[choice];

  async function readFile(file: File | undefined) {
    setFieldErrors({});
    setFormError(null);
    setCandidates([]);
    if (!file) return;
    if (file.size > MAX_FILE_BYTES) {
      setFieldErrors({ file: ['The file is larger than 10 MB'] });
      return;
    }
    let doc: unknown;
    try {
      doc = JSON.parse(await file.text());
    } catch {
      setFieldErrors({ file: ['This file is not valid JSON'] });
      return;
    }
    const found = findCandidates(doc, file.name);
    if (!found.length) {
      setFieldErrors({ file: ['No Polygon or MultiPolygon found in this GeoJSON'] });
      return;
    }
    setCandidates(found);
    setChoice(0);
    setName(found[0].name);
  }

  async function importRegion(e: FormEvent) {
    e.preventDefault();
    setFieldErrors({});
    setFormError(null);
    if (!chosen) {
      setFieldErrors({ file: ['Choose a GeoJSON file with a polygon'] });
      return;
    }
    setBusy(true);
    try {
      const created = await regionsApi.create({ name, geometry: chosen.geometry });
      setRegions((list) => [...(list ?? []), created]);
      setNotice(`Imported ${created.name} (${formatArea(created.area_km2)})`);
      setCandidates([]);
      setName('');
      if (fileRef.current) fileRef.current.value = '';
    } catch (err) {
      if (err instanceof ApiError) {
        const fields: FieldErrors = {};
        for (const [k, v] of Object.entries(err.fields))
          (fields[k === 'name' ? 'name' : 'file'] ??= []).push(...v.map((m) => (k === 'name' || k === '_' ? m : `${k}: ${m}`)));
        setFieldErrors(fields);
        setFormError(err.message);
      } else setFormError('Could not import the region');
    } finally {
      setBusy(false);
    }
  }

  async function remove(r: RegionJson) {
    setConfirming(null);
    try {
      await regionsApi.remove(r.id);
      setRegions((list) => (list ?? []).filter((x) => x.id !== r.id));
      setNotice(`Deleted ${r.name}`);
    } catch (e) {
      setNotice(e instanceof ApiError ? e.message : 'Could not delete the region');
    }
  }

  const columns: Column<RegionJson>[] = [
    { key: 'shape', label: 'Outline', render: (r) => <PolygonPreview geometry={r.geometry} size={44} /> },
    { key: 'name', label: 'Name', sortValue: (r) => r.name.toLowerCase(), render: (r) => <span className="font-semibold">{r.name}</span> },
    { key: 'area', label: 'Area', sortValue: (r) => r.area_km2, render: (r) => formatArea(r.area_km2), className: 'text-right whitespace-nowrap' },
    { key: 'vertices', label: 'Vertices', sortValue: (r) => r.vertex_count, render: (r) => formatCount(r.vertex_count), className: 'text-right' },
    { key: 'updated', label: 'Updated', sortValue: (r) => r.updated_at, render: (r) => formatDate(r.updated_at) },
    {
      key: 'actions',
      label: 'Actions',
      render: (r) =>
        confirming === r.id ? (
          <span className="flex flex-wrap gap-2">
            <button type="button" className="btn-danger py-1" onClick={() => remove(r)}>
              Delete {r.name}
            </button>
            <button type="button" className="btn-secondary py-1" onClick={() => setConfirming(null)}>
              Keep
            </button>
          </span>
        ) : (
          <span className="flex flex-wrap gap-2">
            <a className="btn-secondary py-1" href={`/map?region=${r.id}`}>
              Show on map
            </a>
            <button type="button" className="btn-secondary py-1" onClick={() => setConfirming(r.id)}>
              Delete
            </button>
          </span>
        ),
    },
  ];

  const err = (k: string) =>
    fieldErrors[k]?.map((m) => (
      <p key={m} className="field-error" id={`region-${k}-error`}>
        {m}
      </p>
    ));

  return (
    <div className="mt-6 grid gap-6 lg:grid-cols-[1fr_22rem]">
      <section className="card min-w-0" aria-labelledby="regions-heading">
        <h2 id="regions-heading" className="mb-3">
          Regions
        </h2>
        <p aria-live="polite" className="mb-2 min-h-5 text-sm text-ink-600" data-testid="regions-notice">
          {notice}
        </p>
        {loadError ? (
          <p role="alert" className="text-alarm-700">
            {loadError}
          </p>
        ) : regions === null ? (
          <p className="text-ink-500">Loading regions…</p>
        ) : (
          <SortableTable
            rows={regions}
            columns={columns}
            rowKey={(r) => r.id}
            initialSort={{ key: 'name', dir: 'asc' }}
            empty="No regions yet: import one"
            caption="Regions"
          />
        )}
      </section>
      <section className="card" aria-labelledby="import-region-heading">
        <h2 id="import-region-heading">Import a region</h2>
        <p className="mt-1 text-sm text-ink-600">A GeoJSON file (WGS84 longitude, latitude) with a Polygon or MultiPolygon, bare or as a Feature.</p>
        <form className="mt-3 space-y-3" onSubmit={importRegion} noValidate>
          {formError && (
            <p role="alert" className="text-sm text-alarm-700">
              {formError}
            </p>
          )}
          <div>
            <label htmlFor="region-file" className="field-label">
              GeoJSON file
            </label>
            <input
              id="region-file"
              ref={fileRef}
              type="file"
              accept=".geojson,.json,application/geo+json,application/json"
              className="block w-full text-sm file:mr-3 file:rounded-md file:border file:border-ink-300 file:bg-white file:px-3 file:py-1.5 file:text-sm file:font-semibold file:text-ink-800"
              onChange={(e) => readFile(e.target.files?.[0])}
              aria-invalid={!!fieldErrors.file}
              aria-describedby="region-file-error"
            />
            {err('file')}
          </div>
          {candidates.length > 1 && (
            <div>
              <label htmlFor="region-feature" className="field-label">
                Polygon to import
              </label>
              <select
                id="region-feature"
                className="field-input"
                value={choice}
                onChange={(e) => {
                  setChoice(Number(e.target.value));
                  setName(candidates[Number(e.target.value)].name);
                }}
              >
                {candidates.map((c, i) => (
                  <option key={i} value={i}>
                    {c.label}
                  </option>
                ))}
              </select>
            </div>
          )}
          {chosen && (
            <div className="flex items-center gap-3 text-sm text-ink-600">
              <PolygonPreview geometry={chosen.geometry} size={72} />
              <span>{ringsOf(chosen.geometry)?.length ?? 0} ring(s)</span>
            </div>
          )}
          <div>
            <label htmlFor="region-name" className="field-label">
              Name
            </label>
            <input
              id="region-name"
              className="field-input"
              value={name}
              onChange={(e) => setName(e.target.value)}
              aria-invalid={!!fieldErrors.name}
              aria-describedby="region-name-error"
            />
            {err('name')}
          </div>
          <button type="submit" className="btn-primary w-full" disabled={busy}>
            Import region
          </button>
        </form>
      </section>
    </div>
  );
}
