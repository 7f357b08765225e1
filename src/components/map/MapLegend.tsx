import { useMemo, useState } from 'react';
import { BASEMAP_PALETTE } from './map-style';
import { mastIconDataUrl, sightingIconDataUrl, type OperatorMark } from './mast-icons';

interface Props {
  operators: readonly OperatorMark[];
  defaultOpen?: boolean;
}

type SwatchProps = { colour: string; line?: boolean; dashed?: boolean };

function Swatch({ colour, line = false, dashed = false }: SwatchProps) {
  return line ? (
    <span aria-hidden="true" className="inline-block h-0 w-5" style={{ borderTop: `3px ${dashed ? 'dashed' : 'solid'} ${colour}` }} />
  ) : (
    <span aria-hidden="true" className="inline-block h-3 w-5 rounded-sm border border-ink-200" style={{ background: colour }} />
  );
}

const P = BASEMAP_PALETTE;

/** The mast marks of each status, in the order the legend lists them. */
const MAST_STATUS_KEYS = [
  ['active', 'Active'],
  ['planned', 'Planned (hollow, dashed)'],
  ['decommissioned', 'Decommissioned (grey, crossed)'],
  ['sighting', 'Pending sighting'],
] as const;

/** The basemap's fills and lines. */
const BASEMAP_KEYS: (SwatchProps & { label: string })[] = [
  { colour: P.wood, label: 'Woods' },
  { colour: P.farm, label: 'Farmland' },
  { colour: P.settled, label: 'Built-up' },
  { colour: P.water, label: 'Water' },
  { colour: P.roadMajorCasing, line: true, label: 'Main road' },
  { colour: P.roadMinorCasing, line: true, label: 'Road' },
  { colour: P.track, line: true, dashed: true, label: 'Track' },
  { colour: P.river, line: true, label: 'River' },
];

/** What the marks and colours on the map mean. */
export default function MapLegend({ operators, defaultOpen = true }: Props) {
  const [open, setOpen] = useState(defaultOpen);
  const allIds = useMemo(() => operators.map((o) => o.id), [operators]);
  const icons = useMemo(
    () => ({
      operators: operators.map((o) => ({ ...o, src: mastIconDataUrl('active', [o.id], operators) })),
      active: mastIconDataUrl('active', allIds, operators),
      planned: mastIconDataUrl('planned', allIds.slice(0, 2), operators),
      decommissioned: mastIconDataUrl('decommissioned', allIds.slice(0, 2), operators),
      sighting: sightingIconDataUrl(),
    }),
    [operators, allIds],
  );
  return (
    <section
      aria-labelledby="legend-heading"
      className={`pointer-events-auto flex max-h-full min-h-0 flex-col rounded-lg ${open ? 'w-60' : 'w-auto'} border border-ink-200 bg-white/95 text-xs text-ink-800 shadow-md`}
      data-testid="map-legend"
    >
      <h2 id="legend-heading" className="text-sm">
        <button type="button" className="flex w-full items-center justify-between px-3 py-2 font-semibold" aria-expanded={open} onClick={() => setOpen(!open)}>
          Legend{' '}
          <span aria-hidden="true" className="text-ink-400">
            {open ? '▾' : '▸'}
          </span>
        </button>
      </h2>
      {open && (
        // A scrolling box is reachable by keyboard (tabIndex) so its lower entries can be scrolled to.
        <div className="max-h-[45vh] min-h-0 space-y-3 overflow-y-auto px-3 pb-3" tabIndex={0} role="group" aria-label="Legend entries">
          <div>
            <h3 className="mb-1 font-semibold text-ink-600">Operators on a mast</h3>
            <ul className="space-y-1">
              {icons.operators.map((o) => (
                <li key={o.id} className="flex items-center gap-2">
                  <img src={o.src} alt="" width={24} height={24} />
                  <span className="inline-block h-2.5 w-2.5 rounded-full" style={{ background: o.colour }} aria-hidden="true" />
                  {o.name}
                </li>
              ))}
            </ul>
            <p className="mt-1 text-ink-500">Each operator keeps its own place around the hub.</p>
          </div>
          <div>
            <h3 className="mb-1 font-semibold text-ink-600">Mast status</h3>
            <ul className="space-y-1">
              {MAST_STATUS_KEYS.map(([icon, label]) => (
                <li key={icon} className="flex items-center gap-2">
                  <img src={icons[icon]} alt="" width={24} height={24} />
                  {label}
                </li>
              ))}
            </ul>
            <p className="mt-1 text-ink-500">Zoomed out, overlapping masts are thinned; zoom in to see all.</p>
          </div>
          <div>
            <h3 className="mb-1 font-semibold text-ink-600">Basemap</h3>
            <ul className="grid grid-cols-2 gap-x-2 gap-y-1">
              {BASEMAP_KEYS.map(({ label, ...swatch }) => (
                <li key={label} className="flex items-center gap-2">
                  <Swatch {...swatch} />
                  {label}
                </li>
              ))}
            </ul>
          </div>
        </div>
      )}
    </section>
  );
}
