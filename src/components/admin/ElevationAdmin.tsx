import { useRef, useState } from 'react';
import { elevationApi } from '../../lib/client/elevation-api';
import type { ElevationGridJson } from '../../lib/schemas/elevation';
import { localCheckError, type UploadProgress } from '../../lib/client/api';
import { ELEVATION_FILE_ACCEPT, ELEVATION_FORMAT_LABELS, MAX_ELEVATION_UPLOAD_BYTES } from '../../lib/domain/elevation-formats';
import type { Column } from '../ui/SortableTable';
import { bindText } from '../ui/bind-text';
import { useQuery, useSubmit } from '../ui/use-api';
import { DeleteAction, FormCard, InputField, ListCard, SubmitButton, upsertById, withoutId, useNotice } from './parts';
import { formatBytes, formatDate, formatMetres, formatNumber, formatPercent } from '../../lib/domain/format';

const fmtLat = (v: number) => `${formatNumber(Math.abs(v), 3)}° ${v < 0 ? 'S' : 'N'}`;
const fmtLon = (v: number) => `${formatNumber(Math.abs(v), 3)}° ${v < 0 ? 'W' : 'E'}`;

const fmtBytes = formatBytes;

function fmtArcsec(v: number): string {
  return `${Number(v.toFixed(2))}″`;
}

function Resolution({ g }: { g: ElevationGridJson }) {
  const { lon, lat } = g.resolution_arcsec;
  return (
    <span className="whitespace-nowrap">
      {lon === lat ? fmtArcsec(lon) : `${fmtArcsec(lon)} × ${fmtArcsec(lat)}`}
      <span className="text-ink-600">
        {' '}
        · ≈
        {Math.round(g.resolution_ew_m) === Math.round(g.resolution_ns_m)
          ? `${Math.round(g.resolution_ns_m)} m`
          : `${Math.round(g.resolution_ew_m)} m E–W × ${Math.round(g.resolution_ns_m)} m N–S`}
      </span>
    </span>
  );
}

function Checksum({ sha256 }: { sha256: string }) {
  const [copied, setCopied] = useState(false);
  async function copy() {
    try {
      await navigator.clipboard.writeText(sha256);
      setCopied(true);
      setTimeout(() => setCopied(false), 1500);
    } catch {
      /* clipboard unavailable: the full value is in the title */
    }
  }
  return (
    <button type="button" className="font-mono text-xs text-ink-700 underline decoration-dotted" title={`SHA-256 ${sha256} (click to copy)`} onClick={copy}>
      {copied ? 'copied' : `${sha256.slice(0, 12)}…`}
    </button>
  );
}

function ProgressBar({ progress }: { progress: UploadProgress | null }) {
  const pct = progress && progress.total ? Math.round((progress.loaded / progress.total) * 100) : 0;
  const sent = progress !== null && progress.loaded >= progress.total;
  return (
    <div className="space-y-1" data-testid="elevation-progress">
      <div
        className="h-2 w-full overflow-hidden rounded bg-ink-100"
        role="progressbar"
        aria-label="Upload progress"
        aria-valuemin={0}
        aria-valuemax={100}
        aria-valuenow={pct}
      >
        <div className="h-full bg-ink-600 transition-[width]" style={{ width: `${pct}%` }} />
      </div>
      <p className="text-xs text-ink-600">{sent ? 'Checking and storing the grid…' : `Uploading… ${pct}%`}</p>
    </div>
  );
}

/** The two boxes of the point to check: key, label and an example in the placeholder. */
const COORDINATES = [
  ['lat', 'Latitude', '-47.2'],
  ['lon', 'Longitude', '-128.5'],
] as const;

/** What is wrong with one coordinate box, if anything. An empty box is not 0°: ask for the number instead of checking 0, 0. */
const coordinateProblem = (text: string, label: string): string | null =>
  text.trim() === '' ? `Enter a ${label.toLowerCase()}` : Number.isFinite(Number(text)) ? null : `${label} must be a number`;

function PointCheck() {
  const [point, setPoint] = useState({ lat: '', lon: '' });
  const [answer, setAnswer] = useState<string | null>(null);
  const checking = useSubmit({ failed: 'Could not check the point' });
  const coordinate = bindText(point, setPoint, checking.fields);

  async function check() {
    setAnswer(null);
    const result = await checking.submit(() => elevationApi.sample(Number(point.lat), Number(point.lon)), {
      check: () =>
        Object.fromEntries(
          COORDINATES.flatMap(([key, label]) => {
            const problem = coordinateProblem(point[key], label);
            return problem ? [[key, [problem]]] : [];
          }),
        ),
    });
    if (result.ok) setAnswer(result.data.height_m === null ? 'No elevation data at this point' : `${formatMetres(result.data.height_m)} above sea level`);
    // A refusal that names no field (the server down) is the answer line's to tell.
    else if (!Object.keys(result.error.fields).length) setAnswer(result.error.message);
  }

  return (
    <FormCard
      id="check-elevation"
      title="Check a point"
      intro="The ground height the planner’s terrain profiles will use at a position."
      onSubmit={check}
      sending={{ pending: checking.pending, error: null }}
      submitLabel="Check height"
      actions={
        <>
          <SubmitButton pending={checking.pending} label="Check height" className="btn-secondary w-full" />
          <p aria-live="polite" className="min-h-5 text-sm text-ink-700" data-testid="elevation-point-answer">
            {answer}
          </p>
        </>
      }
    >
      <div className="grid grid-cols-2 gap-3">
        {COORDINATES.map(([key, label, example]) => (
          <InputField key={key} id={`elev-${key}`} label={label} inputMode="decimal" placeholder={example} {...coordinate(key)} />
        ))}
      </div>
    </FormCard>
  );
}

const tooLarge = `The file is larger than ${MAX_ELEVATION_UPLOAD_BYTES / (1024 * 1024)} MB: cut the area into tiles`;

export default function ElevationAdmin() {
  const grids = useQuery('elevation', () => elevationApi.list().then((r) => r.items));
  const uploading = useSubmit({ failed: 'Could not upload the file' });
  const { notice, setNotice, attempt } = useNotice();
  const [file, setFile] = useState<File | null>(null);
  const [progress, setProgress] = useState<UploadProgress | null>(null);
  const fileRef = useRef<HTMLInputElement>(null);
  const abortRef = useRef<AbortController | null>(null);
  const busy = progress !== null;
  const refuseFile = (message: string) => uploading.fail(localCheckError({ file: [message] }));

  function choose(f: File | undefined) {
    uploading.fail(null);
    setFile(f ?? null);
    if (f && f.size > MAX_ELEVATION_UPLOAD_BYTES) refuseFile(tooLarge);
  }

  async function upload() {
    if (!file) return refuseFile('Choose a GeoTIFF or .hgt file');
    if (file.size > MAX_ELEVATION_UPLOAD_BYTES) return refuseFile(tooLarge);
    const controller = new AbortController();
    abortRef.current = controller;
    setProgress({ loaded: 0, total: file.size });
    const result = await uploading.submit(() => elevationApi.upload(file, setProgress, controller.signal));
    abortRef.current = null;
    setProgress(null);
    if (!result.ok) {
      // Cancelled by the person uploading: nothing to report.
      if (result.error.code === 'ABORTED') uploading.fail(null);
      return;
    }
    grids.setData((list) => upsertById(list, result.data));
    setNotice(`Imported ${result.data.name}: ${result.data.width} × ${result.data.height} samples`);
    setFile(null);
    if (fileRef.current) fileRef.current.value = '';
  }

  const remove = (g: ElevationGridJson) =>
    attempt(async () => {
      await elevationApi.remove(g.id);
      grids.setData((list) => withoutId(list, g.id));
      return `Deleted ${g.name}`;
    }, 'Could not delete the grid');

  const columns: Column<ElevationGridJson>[] = [
    {
      key: 'name',
      label: 'File',
      sortValue: (g) => g.name.toLowerCase(),
      render: (g) => (
        <span className="block min-w-[10rem]">
          <span className="block break-all font-semibold">{g.name}</span>
          <span className="text-xs text-ink-500">{ELEVATION_FORMAT_LABELS[g.format]}</span>
        </span>
      ),
    },
    {
      key: 'bounds',
      label: 'Covers',
      sortValue: (g) => g.bbox[3],
      render: (g) => (
        <span className="block whitespace-nowrap text-xs">
          {fmtLat(g.bbox[3])} – {fmtLat(g.bbox[1])}
          <br />
          {fmtLon(g.bbox[0])} – {fmtLon(g.bbox[2])}
        </span>
      ),
    },
    { key: 'resolution', label: 'Resolution', sortValue: (g) => g.resolution_m, render: (g) => <Resolution g={g} /> },
    {
      key: 'size',
      label: 'Size',
      sortValue: (g) => g.byte_size,
      render: (g) => (
        <span className="whitespace-nowrap">
          {g.width} × {g.height}
          <span className="block text-xs text-ink-500">{fmtBytes(g.byte_size)}</span>
        </span>
      ),
    },
    {
      key: 'heights',
      label: 'Heights',
      sortValue: (g) => g.max_m,
      render: (g) => (
        <span className="whitespace-nowrap">
          {g.min_m === null || g.max_m === null ? '—' : `${Math.round(g.min_m)} – ${Math.round(g.max_m)} m`}
          {g.nodata_count > 0 && (
            <span className="block text-xs text-ember-700">
              {formatPercent(g.nodata_count / (g.width * g.height), g.nodata_count / (g.width * g.height) < 0.001 ? 3 : 1)} voids
            </span>
          )}
        </span>
      ),
    },
    { key: 'checksum', label: 'Checksum', render: (g) => <Checksum sha256={g.sha256} /> },
    {
      key: 'added',
      label: 'Added',
      sortValue: (g) => g.created_at,
      render: (g) => (
        <span className="whitespace-nowrap">
          {formatDate(g.created_at)}
          <span className="block text-xs text-ink-500">{g.uploaded_by?.name ?? 'demo data'}</span>
        </span>
      ),
    },
    { key: 'actions', label: 'Actions', render: (g) => <DeleteAction name={g.name} onDelete={() => remove(g)} /> },
  ];

  return (
    <div className="mt-6 space-y-6">
      <ListCard
        id="elevation"
        title="Elevation grids"
        notice={notice}
        list={grids}
        columns={columns}
        empty={
          <span className="block max-w-md mx-auto">
            <span className="block font-semibold text-ink-700">No elevation data yet</span>
            Until a grid covers a path, terrain profiles and clearance checks report the ground there as missing. Import a GeoTIFF or .hgt tile to start.
          </span>
        }
      />
      <div className="grid gap-6 md:grid-cols-2">
        <FormCard
          id="upload-elevation"
          title="Import a grid"
          intro={`A single-band GeoTIFF in EPSG:4326 (WGS 84 latitude/longitude) with heights in metres, or an SRTM .hgt tile named by its south-west corner (e.g. S48W129.hgt). Up to ${MAX_ELEVATION_UPLOAD_BYTES / (1024 * 1024)} MB.`}
          onSubmit={upload}
          sending={{ pending: busy, error: uploading.error }}
          submitLabel="Import grid"
          actions={
            <>
              {busy && <ProgressBar progress={progress} />}
              {busy ? (
                <button type="button" className="btn-secondary w-full" onClick={() => abortRef.current?.abort()}>
                  Cancel upload
                </button>
              ) : (
                <SubmitButton label="Import grid" />
              )}
            </>
          }
        >
          <InputField
            id="elevation-file"
            label="Elevation file"
            inputRef={fileRef}
            type="file"
            accept={ELEVATION_FILE_ACCEPT}
            disabled={busy}
            onChange={(e) => choose(e.target.files?.[0])}
            errors={uploading.fields.file}
            hint={file && !uploading.fields.file ? `${file.name} · ${fmtBytes(file.size)}` : undefined}
          />
        </FormCard>
        <PointCheck />
      </div>
    </div>
  );
}
