import { useEffect, useRef, useState, type FormEvent } from 'react';
import { ApiError, type FieldErrors } from '../../lib/client/api';
import { elevationApi, type ElevationGridJson, type UploadProgress } from '../../lib/client/elevation-api';
import { ELEVATION_FILE_ACCEPT, ELEVATION_FORMAT_LABELS, MAX_ELEVATION_UPLOAD_BYTES } from '../../lib/domain/elevation-formats';
import { SortableTable, type Column } from '../ui/SortableTable';
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

function PointCheck() {
  const [lat, setLat] = useState('');
  const [lon, setLon] = useState('');
  const [answer, setAnswer] = useState<string | null>(null);
  const [fieldErrors, setFieldErrors] = useState<FieldErrors>({});

  async function check(e: FormEvent) {
    e.preventDefault();
    setFieldErrors({});
    setAnswer(null);
    // An empty box is not 0°: ask for both numbers instead of checking the point 0, 0.
    const missing: FieldErrors = {};
    if (lat.trim() === '' || !Number.isFinite(Number(lat))) missing.lat = [lat.trim() === '' ? 'Enter a latitude' : 'Latitude must be a number'];
    if (lon.trim() === '' || !Number.isFinite(Number(lon))) missing.lon = [lon.trim() === '' ? 'Enter a longitude' : 'Longitude must be a number'];
    if (Object.keys(missing).length) {
      setFieldErrors(missing);
      return;
    }
    try {
      const r = await elevationApi.sample(Number(lat), Number(lon));
      setAnswer(r.height_m === null ? 'No elevation data at this point' : `${formatMetres(r.height_m)} above sea level`);
    } catch (err) {
      if (err instanceof ApiError) {
        setFieldErrors(err.fields);
        setAnswer(Object.keys(err.fields).length ? null : err.message);
      } else setAnswer('Could not check the point');
    }
  }

  const err = (k: string) =>
    fieldErrors[k]?.map((m) => (
      <p key={m} className="field-error" id={`elev-${k}-error`}>
        {m}
      </p>
    ));
  return (
    <form className="mt-3 space-y-3" onSubmit={check} noValidate>
      <div className="grid grid-cols-2 gap-3">
        <div>
          <label htmlFor="elev-lat" className="field-label">
            Latitude
          </label>
          <input
            id="elev-lat"
            inputMode="decimal"
            className="field-input"
            placeholder="-47.2"
            value={lat}
            onChange={(e) => setLat(e.target.value)}
            aria-invalid={!!fieldErrors.lat}
            aria-describedby="elev-lat-error"
          />
          {err('lat')}
        </div>
        <div>
          <label htmlFor="elev-lon" className="field-label">
            Longitude
          </label>
          <input
            id="elev-lon"
            inputMode="decimal"
            className="field-input"
            placeholder="-128.5"
            value={lon}
            onChange={(e) => setLon(e.target.value)}
            aria-invalid={!!fieldErrors.lon}
            aria-describedby="elev-lon-error"
          />
          {err('lon')}
        </div>
      </div>
      <button type="submit" className="btn-secondary w-full">
        Check height
      </button>
      <p aria-live="polite" className="min-h-5 text-sm text-ink-700" data-testid="elevation-point-answer">
        {answer}
      </p>
    </form>
  );
}

export default function ElevationAdmin() {
  const [grids, setGrids] = useState<ElevationGridJson[] | null>(null);
  const [loadError, setLoadError] = useState<string | null>(null);
  const [notice, setNotice] = useState<string | null>(null);
  const [file, setFile] = useState<File | null>(null);
  const [fieldErrors, setFieldErrors] = useState<FieldErrors>({});
  const [formError, setFormError] = useState<string | null>(null);
  const [progress, setProgress] = useState<UploadProgress | null>(null);
  const [confirming, setConfirming] = useState<string | null>(null);
  const fileRef = useRef<HTMLInputElement>(null);
  const abortRef = useRef<AbortController | null>(null);
  const busy = progress !== null;

  useEffect(() => {
    elevationApi.list().then(
      (r) => setGrids(r.items),
      (e: ApiError) => setLoadError(e.message),
    );
  }, []);

  function choose(f: File | undefined) {
    setFieldErrors({});
    setFormError(null);
    setFile(f ?? null);
    if (f && f.size > MAX_ELEVATION_UPLOAD_BYTES) {
      setFieldErrors({ file: [`The file is larger than ${MAX_ELEVATION_UPLOAD_BYTES / (1024 * 1024)} MB: cut the area into tiles`] });
    }
  }

  async function upload(e: FormEvent) {
    e.preventDefault();
    setFieldErrors({});
    setFormError(null);
    if (!file) {
      setFieldErrors({ file: ['Choose a GeoTIFF or .hgt file'] });
      return;
    }
    if (file.size > MAX_ELEVATION_UPLOAD_BYTES) {
      setFieldErrors({ file: [`The file is larger than ${MAX_ELEVATION_UPLOAD_BYTES / (1024 * 1024)} MB: cut the area into tiles`] });
      return;
    }
    const controller = new AbortController();
    abortRef.current = controller;
    setProgress({ loaded: 0, total: file.size });
    try {
      const created = await elevationApi.upload(file, setProgress, controller.signal);
      setGrids((list) => [...(list ?? []), created]);
      setNotice(`Imported ${created.name}: ${created.width} × ${created.height} samples`);
      setFile(null);
      if (fileRef.current) fileRef.current.value = '';
    } catch (err) {
      if (err instanceof ApiError) {
        if (err.code !== 'ABORTED') {
          setFormError(err.message);
          if (err.fields.file) setFieldErrors({ file: err.fields.file });
        }
      } else setFormError('Could not upload the file');
    } finally {
      abortRef.current = null;
      setProgress(null);
    }
  }

  async function remove(g: ElevationGridJson) {
    setConfirming(null);
    try {
      await elevationApi.remove(g.id);
      setGrids((list) => (list ?? []).filter((x) => x.id !== g.id));
      setNotice(`Deleted ${g.name}`);
    } catch (e) {
      setNotice(e instanceof ApiError ? e.message : 'Could not delete the grid');
    }
  }

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
    {
      key: 'actions',
      label: 'Actions',
      render: (g) =>
        confirming === g.id ? (
          <span className="flex flex-wrap gap-2">
            <button type="button" className="btn-danger py-1" onClick={() => remove(g)}>
              Delete {g.name}
            </button>
            <button type="button" className="btn-secondary py-1" onClick={() => setConfirming(null)}>
              Keep
            </button>
          </span>
        ) : (
          <button type="button" className="btn-secondary py-1" onClick={() => setConfirming(g.id)}>
            Delete
          </button>
        ),
    },
  ];

  const err = (k: string) =>
    fieldErrors[k]?.map((m) => (
      <p key={m} className="field-error" id={`elevation-${k}-error`}>
        {m}
      </p>
    ));

  return (
    <div className="mt-6 space-y-6">
      <section className="card min-w-0" aria-labelledby="elevation-heading">
        <h2 id="elevation-heading" className="mb-3">
          Elevation grids
        </h2>
        <p aria-live="polite" className="mb-2 min-h-5 text-sm text-ink-600" data-testid="elevation-notice">
          {notice}
        </p>
        {loadError ? (
          <p role="alert" className="text-alarm-700">
            {loadError}
          </p>
        ) : grids === null ? (
          <p className="text-ink-500">Loading elevation grids…</p>
        ) : (
          <SortableTable
            rows={grids}
            columns={columns}
            rowKey={(g) => g.id}
            initialSort={{ key: 'name', dir: 'asc' }}
            caption="Elevation grids"
            empty={
              <span className="block max-w-md mx-auto">
                <span className="block font-semibold text-ink-700">No elevation data yet</span>
                Until a grid covers a path, terrain profiles and clearance checks report the ground there as missing. Import a GeoTIFF or .hgt tile to start.
              </span>
            }
          />
        )}
      </section>
      <div className="grid gap-6 md:grid-cols-2">
        <section className="card" aria-labelledby="upload-elevation-heading">
          <h2 id="upload-elevation-heading">Import a grid</h2>
          <p className="mt-1 text-sm text-ink-600">
            A single-band GeoTIFF in EPSG:4326 (WGS 84 latitude/longitude) with heights in metres, or an SRTM .hgt tile named by its south-west corner (e.g.
            S48W129.hgt). Up to {MAX_ELEVATION_UPLOAD_BYTES / (1024 * 1024)} MB.
          </p>
          <form className="mt-3 space-y-3" onSubmit={upload} noValidate>
            {formError && (
              <p role="alert" className="text-sm text-alarm-700">
                {formError}
              </p>
            )}
            <div>
              <label htmlFor="elevation-file" className="field-label">
                Elevation file
              </label>
              <input
                id="elevation-file"
                ref={fileRef}
                type="file"
                accept={ELEVATION_FILE_ACCEPT}
                disabled={busy}
                className="block w-full text-sm file:mr-3 file:rounded-md file:border file:border-ink-300 file:bg-white file:px-3 file:py-1.5 file:text-sm file:font-semibold file:text-ink-800"
                onChange={(e) => choose(e.target.files?.[0])}
                aria-invalid={!!fieldErrors.file}
                aria-describedby="elevation-file-error"
              />
              {file && !fieldErrors.file && (
                <p className="mt-1 text-xs text-ink-500">
                  {file.name} · {fmtBytes(file.size)}
                </p>
              )}
              {err('file')}
            </div>
            {busy && <ProgressBar progress={progress} />}
            {busy ? (
              <button type="button" className="btn-secondary w-full" onClick={() => abortRef.current?.abort()}>
                Cancel upload
              </button>
            ) : (
              <button type="submit" className="btn-primary w-full">
                Import grid
              </button>
            )}
          </form>
        </section>
        <section className="card" aria-labelledby="check-elevation-heading">
          <h2 id="check-elevation-heading">Check a point</h2>
          <p className="mt-1 text-sm text-ink-600">The ground height the planner’s terrain profiles will use at a position.</p>
          <PointCheck />
        </section>
      </div>
    </div>
  );
}
