import { Bar, BarChart, CartesianGrid, Cell, LabelList, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';

export interface CountBar {
  label: string;
  value: number;
  /** Bar colour (an operator's own); the ink colour otherwise. */
  colour?: string;
}

interface Props {
  /** What is counted, e.g. "Cells by operator" (also the chart's accessible name). */
  title: string;
  bars: CountBar[];
  testId?: string;
}

const ROW_PX = 30;

/** A small horizontal bar chart of counts; the table beside it holds the same numbers for screen readers. */
export default function CountChart({ title, bars, testId }: Props) {
  if (bars.length === 0) return null;
  const height = bars.length * ROW_PX + 36;
  const labelWidth = Math.min(140, Math.max(48, ...bars.map((b) => b.label.length * 7)));
  return (
    <figure className="w-full" data-testid={testId} aria-hidden="true">
      <div style={{ height }} className="w-full">
        <ResponsiveContainer>
          <BarChart data={bars} layout="vertical" margin={{ top: 4, right: 36, bottom: 4, left: 4 }}>
            <CartesianGrid stroke="#e3e9f0" horizontal={false} />
            <XAxis type="number" allowDecimals={false} tick={{ fontSize: 11, fill: '#36516c' }} />
            <YAxis type="category" dataKey="label" width={labelWidth} tick={{ fontSize: 11, fill: '#1f3043' }} interval={0} />
            <Tooltip cursor={{ fill: '#f3f6f9' }} formatter={(v) => [String(v), title]} />
            <Bar dataKey="value" isAnimationActive={false} barSize={16}>
              {bars.map((b) => (
                <Cell key={b.label} fill={b.colour ?? '#476785'} />
              ))}
              <LabelList dataKey="value" position="right" style={{ fontSize: 11, fill: '#1f3043' }} />
            </Bar>
          </BarChart>
        </ResponsiveContainer>
      </div>
    </figure>
  );
}
