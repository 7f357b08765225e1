import { CopyButton } from './CopyButton';

export function ResultRow({ label, value, unit, testId }: { label: string; value: string; unit?: string; testId?: string }) {
  const text = unit ? `${value} ${unit}` : value;
  return (
    <div className="flex items-center justify-between gap-3 border-b border-ink-100 py-1.5 last:border-0">
      <dt className="text-sm text-ink-600">{label}</dt>
      <dd className="flex items-center gap-2 text-right">
        <span className="font-semibold tabular-nums" data-testid={testId}>
          {value}
        </span>
        {unit && <span className="text-sm text-ink-500">{unit}</span>}
        <CopyButton text={text} />
      </dd>
    </div>
  );
}
