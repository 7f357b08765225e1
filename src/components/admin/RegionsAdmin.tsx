import { useMemo, useRef, useState } from 'react';
import { localCheckError } from '../../lib/client/api';
import { regionsApi } from '../../lib/client/regions-api';
import type { RegionJson } from '../../lib/schemas/regions';
import type { Column } from '../ui/SortableTable';
import { useQuery, useSubmit } from '../ui/use-api';
import { DeleteAction, FormCard, InputField, ListBesideForm, ListCard, SelectField, upsertById, withoutId, useNotice } from './parts';
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
  const regions = useQuery('regions', () => regionsApi.list(OUTLINE_PREVIEW_ZOOM).then((r) => r.items));
  const importing = useSubmit({ failed: 'Could not import the region' });
  const { notice, setNotice, attempt } = useNotice();
  const [candidates, setCandidates] = useState<Candidate[]>([]);
  const [choice, setChoice] = useState(0);
  const [name, setName] = useState('');
  const fileRef = useRef<HTMLInputElement>(null);

  const chosen = candidates[choice];
  const refuseFile = (message: string) => importing.fail(localCheckError({ file: [message] }));

  async function readFile(file: File | undefined) {
    importing.fail(null);
    setCandidates([]);
    if (!file) return;
    if (file.size > MAX_FILE_BYTES) return refuseFile('The file is larger than 10 MB');
    let doc: unknown;
    try {
      doc = JSON.parse(await file.text());
    } catch {
      return refuseFile('This file is not valid JSON');
    }
    const found = findCandidates(doc, file.name);
    if (!found.length) return refuseFile('No Polygon or MultiPolygon found in this GeoJSON');
    setCandidates(found);
    setChoice(0);
    setName(found[0].name);
  }

  async function importRegion() {
    if (!chosen) return refuseFile('Choose a GeoJSON file with a polygon');
    const result = await importing.submit(() => regionsApi.create({ name, geometry: chosen.geometry }));
    if (!result.ok) return;
    regions.setData((list) => upsertById(list, result.data));
    setNotice(`Imported ${result.data.name} (${formatArea(result.data.area_km2)})`);
    setCandidates([]);
    setName('');
    if (fileRef.current) fileRef.current.value = '';
  }

  // The server names problems inside the geometry by their path: show them beside the file.
  const fileErrors = Object.entries(importing.fields)
    .filter(([k]) => k !== 'name')
    .flatMap(([k, v]) => v.map((m) => (k === 'file' || k === '_' ? m : `${k}: ${m}`)));

  const remove = (r: RegionJson) =>
    attempt(async () => {
      await regionsApi.remove(r.id);
      regions.setData((list) => withoutId(list, r.id));
      return `Deleted ${r.name}`;
    }, 'Could not delete the region');

  const columns: Column<RegionJson>[] = [
    { key: 'shape', label: 'Outline', render: (r) => <PolygonPreview geometry={r.geometry} size={44} /> },
    { key: 'name', label: 'Name', sortValue: (r) => r.name.toLowerCase(), render: (r) => <span className="font-semibold">{r.name}</span> },
    { key: 'area', label: 'Area', sortValue: (r) => r.area_km2, render: (r) => formatArea(r.area_km2), className: 'text-right whitespace-nowrap' },
    { key: 'vertices', label: 'Vertices', sortValue: (r) => r.vertex_count, render: (r) => formatCount(r.vertex_count), className: 'text-right' },
    { key: 'updated', label: 'Updated', sortValue: (r) => r.updated_at, render: (r) => formatDate(r.updated_at) },
    {
      key: 'actions',
      label: 'Actions',
      render: (r) => (
        <DeleteAction name={r.name} onDelete={() => remove(r)}>
          <a className="btn-secondary py-1" href={`/map?region=${r.id}`}>
            Show on map
          </a>
        </DeleteAction>
      ),
    },
  ];

  return (
    <ListBesideForm form="wide">
      <ListCard id="regions" title="Regions" notice={notice} list={regions} columns={columns} empty="No regions yet: import one" />
      <FormCard
        id="import-region"
        title="Import a region"
        intro="A GeoJSON file (WGS84 longitude, latitude) with a Polygon or MultiPolygon, bare or as a Feature."
        onSubmit={importRegion}
        sending={importing}
        submitLabel="Import region"
      >
        <InputField
          id="region-file"
          label="GeoJSON file"
          inputRef={fileRef}
          type="file"
          accept=".geojson,.json,application/geo+json,application/json"
          onChange={(e) => readFile(e.target.files?.[0])}
          errors={fileErrors}
        />
        {candidates.length > 1 && (
          <SelectField
            id="region-feature"
            label="Polygon to import"
            value={String(choice)}
            options={candidates.map((_, i) => String(i))}
            labels={Object.fromEntries(candidates.map((c, i) => [String(i), c.label]))}
            onChange={(v) => {
              setChoice(Number(v));
              setName(candidates[Number(v)].name);
            }}
          />
        )}
        {chosen && (
          <div className="flex items-center gap-3 text-sm text-ink-600">
            <PolygonPreview geometry={chosen.geometry} size={72} />
            <span>{ringsOf(chosen.geometry)?.length ?? 0} ring(s)</span>
          </div>
        )}
        <InputField id="region-name" label="Name" value={name} onChange={(e) => setName(e.target.value)} errors={importing.fields.name} />
      </FormCard>
    </ListBesideForm>
  );
}
