import { Area, CartesianGrid, ComposedChart, Line, ReferenceDot, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import type { PathJson } from '../../lib/schemas/tools';
import { formatDb, formatDistance, formatMetres } from '../../lib/domain/format';

interface Props {
  path: PathJson;
}

/** The series, drawn and named in the legend below the chart (which wraps on a phone instead of covering the axis). */
const SERIES = [
  { key: 'ground', name: 'Ground + earth bulge', colour: '#6b5a3a', dash: undefined },
  { key: 'los', name: 'Line of sight', colour: '#1f3043', dash: undefined },
  { key: 'fresnelLow', name: '1st Fresnel zone (lower edge)', colour: '#476785', dash: '5 4' },
  { key: 'fresnel60', name: '60 % of the zone', colour: '#b46d10', dash: '2 3' },
] as const;

/** Ground (with earth bulge), line of sight and the first Fresnel zone between customer (left) and mast. */
export default function TerrainChart({ path }: Props) {
  const terrain = path.terrain;
  if (!terrain) return <p className="text-sm text-ink-600">{path.terrain_note ?? 'No elevation data covers this path.'}</p>;
  const data = terrain.profile.map((p) => ({
    km: p.distance_m / 1000,
    ground: +(p.ground_m + p.bulge_m).toFixed(1),
    los: p.los_m,
    fresnelLow: +(p.los_m - p.fresnel_m).toFixed(1),
    fresnel60: +(p.los_m - 0.6 * p.fresnel_m).toFixed(1),
  }));
  const worst =
    terrain.worst_distance_m === null
      ? null
      : data.reduce(
          (best, d) => (Math.abs(d.km * 1000 - terrain.worst_distance_m!) < Math.abs(best.km * 1000 - terrain.worst_distance_m!) ? d : best),
          data[0],
        );
  const low = Math.min(...data.map((d) => Math.min(d.ground, d.fresnelLow)));
  return (
    <figure>
      <div className="h-64 w-full" data-testid="terrain-chart">
        <ResponsiveContainer>
          <ComposedChart data={data} margin={{ top: 8, right: 12, bottom: 18, left: 4 }}>
            <CartesianGrid stroke="#e3e9f0" />
            <XAxis
              dataKey="km"
              type="number"
              domain={[0, 'dataMax']}
              tickFormatter={(v: number) => v.toFixed(1)}
              label={{ value: 'km from the customer', position: 'insideBottom', offset: -10, fontSize: 12 }}
              fontSize={12}
            />
            <YAxis domain={[Math.floor(low / 10) * 10, 'auto']} fontSize={12} label={{ value: 'm', angle: -90, position: 'insideLeft', fontSize: 12 }} />
            <Tooltip formatter={(v) => formatMetres(Number(v))} labelFormatter={(v) => formatDistance(Number(v) * 1000)} />
            <Area
              type="monotone"
              dataKey="ground"
              name="Ground + earth bulge"
              stroke="#6b5a3a"
              fill="#cdbb92"
              fillOpacity={0.7}
              isAnimationActive={false}
              baseValue="dataMin"
            />
            <Line type="linear" dataKey="los" name="Line of sight" stroke="#1f3043" strokeWidth={2} dot={false} isAnimationActive={false} />
            <Line
              type="monotone"
              dataKey="fresnelLow"
              name="1st Fresnel zone (lower edge)"
              stroke="#476785"
              strokeDasharray="5 4"
              dot={false}
              isAnimationActive={false}
            />
            <Line type="monotone" dataKey="fresnel60" name="60 % of the zone" stroke="#b46d10" strokeDasharray="2 3" dot={false} isAnimationActive={false} />
            {worst && <ReferenceDot x={worst.km} y={worst.ground} r={5} fill="#b4442f" stroke="white" />}
          </ComposedChart>
        </ResponsiveContainer>
      </div>
      <ul className="mt-1 flex flex-wrap gap-x-4 gap-y-1 text-xs text-ink-800" aria-label="Legend" data-testid="terrain-legend">
        {SERIES.map((series) => (
          <li key={series.key} className="flex items-center gap-1">
            <svg width="22" height="8" aria-hidden="true">
              <line x1="1" y1="4" x2="21" y2="4" stroke={series.colour} strokeWidth={series.key === 'ground' ? 6 : 2} strokeDasharray={series.dash} />
            </svg>
            {series.name}
          </li>
        ))}
      </ul>
      <figcaption className="mt-2 text-sm text-ink-700">
        {terrain.status === 'clear' && 'Clear: at least 60 % of the first Fresnel zone is free along the path.'}
        {terrain.status === 'fresnel' &&
          `Fresnel zone infringed: worst clearance ${formatMetres(terrain.worst_clearance_m)} at ${formatDistance(terrain.worst_distance_m ?? 0)}, about ${formatDb(terrain.diffraction_loss_db)} diffraction loss.`}
        {terrain.status === 'obstructed' &&
          `Obstructed: the ground rises ${formatMetres(Math.abs(terrain.worst_clearance_m ?? 0))} above the line of sight at ${formatDistance(terrain.worst_distance_m ?? 0)}, about ${formatDb(terrain.diffraction_loss_db)} diffraction loss.`}
      </figcaption>
    </figure>
  );
}
