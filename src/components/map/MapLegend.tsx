import { useMemo, useState } from 'react';
import { BASEMAP_PALETTE } from './map-style';
import { mastIconDataUrl, sightingIconDataUrl, type OperatorMark } from './mast-icons';

interface Props {
  operators: readonly OperatorMark[];
  defaultOpen?: boolean;
}

function Swatch({ colour, line = false, dashed = false }: { colour: string; line?: boolean; dashed?: boolean }) {
  return line ? (
    <span aria-hidden="true" className="inline-block h-0 w-5" style={{ borderTop: `3px ${dashed ? 'dashed' : 'solid'} ${colour}` }} />
  ) : (
    <span aria-hidden="true" className="inline-block h-3 w-5 rounded-sm border border-ink-200" style={{ background: colour }} />
  );
}

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
  const P = BASEMAP_PALETTE;

  return (
    <section
      aria-labelledby="legend-heading"
      className={`pointer-events-auto rounded-lg ${open ? 'w-60' : 'w-auto'} border border-ink-200 bg-white/95 text-xs text-ink-800 shadow-md`}
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
        <div className="max-h-[45vh] space-y-3 overflow-y-auto px-3 pb-3" tabIndex={0} role="group" aria-label="Legend entries">
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
              <li className="flex items-center gap-2">
                <img src={icons.active} alt="" width={24} height={24} />
                Active
              </li>
              <li className="flex items-center gap-2">
                <img src={icons.planned} alt="" width={24} height={24} />
                Planned (hollow, dashed)
              </li>
              <li className="flex items-center gap-2">
                <img src={icons.decommissioned} alt="" width={24} height={24} />
                Decommissioned (grey, crossed)
              </li>
              <li className="flex items-center gap-2">
                <img src={icons.sighting} alt="" width={24} height={24} />
                Pending sighting
              </li>
            </ul>
            <p className="mt-1 text-ink-500">Zoomed out, overlapping masts are thinned; zoom in to see all.</p>
          </div>
          <div>
            <h3 className="mb-1 font-semibold text-ink-600">Basemap</h3>
            <ul className="grid grid-cols-2 gap-x-2 gap-y-1">
              <li className="flex items-center gap-2">
                <Swatch colour={P.wood} />
                Woods
              </li>
              <li className="flex items-center gap-2">
                <Swatch colour={P.farm} />
                Farmland
              </li>
              <li className="flex items-center gap-2">
                <Swatch colour={P.settled} />
                Built-up
              </li>
              <li className="flex items-center gap-2">
                <Swatch colour={P.water} />
                Water
              </li>
              <li className="flex items-center gap-2">
                <Swatch colour={P.roadMajorCasing} line />
                Main road
              </li>
              <li className="flex items-center gap-2">
                <Swatch colour={P.roadMinorCasing} line />
                Road
              </li>
              <li className="flex items-center gap-2">
                <Swatch colour={P.track} line dashed />
                Track
              </li>
              <li className="flex items-center gap-2">
                <Swatch colour={P.river} line />
                River
              </li>
            </ul>
          </div>
        </div>
      )}
    </section>
  );
}
