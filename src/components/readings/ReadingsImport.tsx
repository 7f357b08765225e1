import { useRef, useState, type FormEvent } from 'react';
import { jobsApi, readingsApi } from '../../lib/client/readings-api';
import type { JobJson } from '../../lib/schemas/jobs';
import { useQuery, useSubmit } from '../ui/use-api';

type Stage =
  | { kind: 'idle' }
  | { kind: 'uploading'; fraction: number }
  | { kind: 'job'; jobId: string }
  | { kind: 'rejected'; message: string; lines: Array<[string, string[]]> }
  | { kind: 'error'; message: string };

/** How often the job is asked about while it runs. */
const POLL_MS = 700;
const isRunning = (job: JobJson) => job.state !== 'completed' && job.state !== 'failed';

const lineOf = (key: string) => Number(key.replace(/\D/g, ''));

function ProgressBar({ label, percent }: { label: string; percent: number }) {
  return (
    <div className="mt-3">
      <div className="flex justify-between text-sm text-ink-700">
        <span>{label}</span>
        <span>{Math.round(percent)} %</span>
      </div>
      <div
        className="mt-1 h-3 w-full overflow-hidden rounded bg-ink-100"
        role="progressbar"
        aria-label={label}
        aria-valuenow={Math.round(percent)}
        aria-valuemin={0}
        aria-valuemax={100}
      >
        <div className="h-3 bg-sky-700 transition-all" style={{ width: `${percent}%` }} />
      </div>
    </div>
  );
}

/** Upload a survey log: the upload's progress, then the job's, then its report. */
export default function ReadingsImport() {
  const [file, setFile] = useState<File | null>(null);
  const [stage, setStage] = useState<Stage>({ kind: 'idle' });
  const input = useRef<HTMLInputElement>(null);
  const upload = useSubmit({ failed: 'Could not send the file' });
  const jobId = stage.kind === 'job' ? stage.jobId : null;
  const polled = useQuery(jobId, () => jobsApi.get(jobId!), { failed: 'Could not read the import job', poll: { everyMs: POLL_MS, while: isRunning } });
  const job = jobId ? polled.data : null;
  const jobError = jobId ? (polled.error?.message ?? null) : null;
  const finished = jobError !== null || (job !== null && !isRunning(job));

  async function submit(e: FormEvent) {
    e.preventDefault();
    if (!file) {
      setStage({ kind: 'error', message: 'Choose a CSV file first' });
      return;
    }
    setStage({ kind: 'uploading', fraction: 0 });
    const sent = await upload.submit(() => readingsApi.importFile(file, (p) => setStage({ kind: 'uploading', fraction: p.loaded / p.total })));
    if (sent.ok) {
      setStage({ kind: 'job', jobId: sent.data.job_id });
      if (input.current) input.current.value = '';
      setFile(null);
      return;
    }
    const err = sent.error;
    const lines = Object.entries(err.fields)
      .filter(([k]) => k.startsWith('line '))
      .sort(([a], [b]) => lineOf(a) - lineOf(b));
    const fileProblems = err.fields.file ?? [];
    setStage(
      lines.length
        ? { kind: 'rejected', message: err.message, lines }
        : { kind: 'error', message: [err.message, ...fileProblems.filter((m) => m !== err.message)].join(' ') },
    );
  }

  const busy = stage.kind === 'uploading' || (stage.kind === 'job' && !finished);

  return (
    <div className="mt-4 max-w-3xl">
      <form onSubmit={submit} className="rounded border border-ink-200 bg-white p-4">
        <label className="block text-sm font-medium text-ink-800" htmlFor="readings-file">
          Survey log (CSV)
        </label>
        <input
          id="readings-file"
          ref={input}
          type="file"
          accept=".csv,text/csv"
          className="mt-1 block w-full text-sm"
          onChange={(e) => setFile(e.target.files?.[0] ?? null)}
        />
        <div className="mt-3 flex flex-wrap items-center gap-3">
          <button type="submit" disabled={busy} className="rounded bg-sky-800 px-4 py-2 text-sm font-medium text-white disabled:opacity-50">
            Import readings
          </button>
          <a href="/api/readings/sample.csv" className="text-sm text-sky-800 underline" download>
            Download the sample CSV
          </a>
        </div>
        {stage.kind === 'uploading' && <ProgressBar label="Uploading and checking" percent={stage.fraction * 100} />}
        {stage.kind === 'job' && !jobError && <ProgressBar label={job?.phase ? `Job: ${job.phase}` : 'Job queued'} percent={job?.progress ?? 0} />}
      </form>

      <div aria-live="polite">
        {job?.state === 'completed' && (
          <div className="mt-4 rounded border border-emerald-300 bg-emerald-50 p-4 text-sm" data-testid="import-report">
            <p className="font-medium">{job.message}</p>
            <p className="mt-1 text-ink-700">
              Rows {job.counts.rows ?? 0} · stored {job.counts.imported ?? 0} · matched to a cell {job.counts.matched ?? 0}
            </p>
          </div>
        )}
        {job?.state === 'failed' && <p className="mt-4 rounded border border-red-300 bg-red-50 p-4 text-sm">{job.message}</p>}
        {(stage.kind === 'error' || jobError) && (
          <p className="mt-4 rounded border border-red-300 bg-red-50 p-4 text-sm">{stage.kind === 'error' ? stage.message : jobError}</p>
        )}
        {stage.kind === 'rejected' && (
          <div className="mt-4 rounded border border-red-300 bg-red-50 p-4 text-sm" data-testid="import-report">
            <p className="font-medium">{stage.message}</p>
            <table className="data-table stack mt-2">
              <thead>
                <tr>
                  <th scope="col">Line</th>
                  <th scope="col">Problem</th>
                </tr>
              </thead>
              <tbody>
                {stage.lines.map(([key, messages]) => (
                  <tr key={key}>
                    <td className="tabular-nums" data-label="Line">
                      {lineOf(key)}
                    </td>
                    <td data-label="Problem">{messages.join('; ')}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        )}
      </div>
    </div>
  );
}
