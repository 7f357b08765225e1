import type { FieldErrors } from '../../lib/client/api';

export interface FrequencyRow {
  freq: string;
  value: string;
}

interface Props {
  /** Field name in the API body, e.g. gain_table; errors arrive as gain_table.2.freq_mhz. */
  field: string;
  valueKey: string;
  valueLabel: string;
  valueStep: string;
  rows: FrequencyRow[];
  onChange: (rows: FrequencyRow[]) => void;
  errors: FieldErrors;
}

/** Rows of frequency → value, with the server's messages beside each input. */
export function FrequencyTableEditor({ field, valueKey, valueLabel, valueStep, rows, onChange, errors }: Props) {
  const set = (i: number, patch: Partial<FrequencyRow>) => onChange(rows.map((r, j) => (j === i ? { ...r, ...patch } : r)));
  const msg = (key: string) =>
    errors[key]?.map((m) => (
      <p key={m} className="field-error">
        {m}
      </p>
    ));
  return (
    <fieldset>
      <legend className="field-label">{valueLabel} over frequency</legend>
      <p className="mb-2 text-xs text-ink-600">From the lowest frequency up. Values between rows are interpolated linearly.</p>
      {msg(field)}
      <table className="w-full text-sm">
        <thead>
          <tr className="text-left text-xs text-ink-600">
            <th scope="col" className="pb-1 font-semibold">
              MHz
            </th>
            <th scope="col" className="pb-1 font-semibold">
              {valueLabel}
            </th>
            <th scope="col">
              <span className="sr-only">Remove</span>
            </th>
          </tr>
        </thead>
        <tbody>
          {rows.map((r, i) => {
            const fKey = `${field}.${i}.freq_mhz`;
            const vKey = `${field}.${i}.${valueKey}`;
            return (
              <tr key={i} className="align-top">
                <td className="pb-1 pr-2">
                  <input
                    aria-label={`Row ${i + 1} frequency, MHz`}
                    inputMode="decimal"
                    className="field-input py-1"
                    value={r.freq}
                    onChange={(e) => set(i, { freq: e.target.value })}
                    aria-invalid={!!errors[fKey]}
                  />
                  {msg(fKey)}
                </td>
                <td className="pb-1 pr-2">
                  <input
                    aria-label={`Row ${i + 1} ${valueLabel}`}
                    inputMode="decimal"
                    step={valueStep}
                    className="field-input py-1"
                    value={r.value}
                    onChange={(e) => set(i, { value: e.target.value })}
                    aria-invalid={!!errors[vKey]}
                  />
                  {msg(vKey)}
                </td>
                <td className="pb-1">
                  <button
                    type="button"
                    className="btn-secondary px-2 py-1"
                    onClick={() => onChange(rows.filter((_, j) => j !== i))}
                    aria-label={`Remove row ${i + 1}`}
                    disabled={rows.length === 1}
                  >
                    ×
                  </button>
                </td>
              </tr>
            );
          })}
        </tbody>
      </table>
      <button type="button" className="btn-secondary mt-1 py-1" onClick={() => onChange([...rows, { freq: '', value: '' }])}>
        Add row
      </button>
    </fieldset>
  );
}

/** Form text to a number for the schema: blank stays undefined, junk becomes NaN (a field error). */
export const toNumber = (s: string): number | undefined => (s.trim() === '' ? undefined : Number(s.trim().replace(',', '.')));
