import { pairCells } from '../../lib/domain/duplicates';
import type { CellJson } from '../../lib/schemas/masts';
import type { SightingCellJson } from '../../lib/schemas/sightings';
import { TECH_LABELS } from '../map/MapFilters';

interface Props {
  sightingCells: SightingCellJson[];
  mastCells: CellJson[] | null;
  mastName: string | null;
}

const identity = <C extends { operator: { id: string }; tech: string; channel: number; pci: number | null }>(c: C) => ({
  ...c,
  operatorId: c.operator.id,
});

function CellText({
  c,
}: {
  c: {
    operator: { name: string; colour: string };
    tech: keyof typeof TECH_LABELS;
    band: string;
    channel: number;
    pci: number | null;
    sector_azimuth_deg: number | null;
  };
}) {
  return (
    <span className="flex flex-col">
      <span className="flex items-center gap-1.5 font-semibold">
        <span className="inline-block h-2.5 w-2.5 rounded-full" style={{ background: c.operator.colour }} aria-hidden="true" />
        {c.operator.name}
      </span>
      <span>
        {TECH_LABELS[c.tech]} {c.band} · ch {c.channel} · PCI {c.pci ?? '—'}
        {c.sector_azimuth_deg !== null ? ` · ${Math.round(c.sector_azimuth_deg)}°` : ''}
      </span>
    </span>
  );
}

/** The sighting's cells beside a mast's cells; the same cell on both sides shares a row. */
export default function CellsSideBySide({ sightingCells, mastCells, mastName }: Props) {
  const pairs = pairCells(sightingCells.map(identity), (mastCells ?? []).map(identity));
  if (pairs.length === 0) return <p className="text-sm text-ink-500">No cells were reported{mastName ? ' and the mast has none' : ''}.</p>;
  return (
    <table className="data-table stack" data-testid="cells-side-by-side">
      <caption className="sr-only">Cells reported in the sighting beside the cells of {mastName ?? 'no mast'}</caption>
      <thead>
        <tr>
          <th scope="col">Reported</th>
          <th scope="col">{mastName ? `On ${mastName}` : 'On the mast'}</th>
        </tr>
      </thead>
      <tbody>
        {pairs.map((p, i) => (
          <tr key={i} className={p.shared ? 'bg-moss-50' : p.sighting && p.mast ? 'bg-ink-50' : undefined}>
            <td data-label="Reported">
              {p.sighting ? (
                <>
                  <CellText c={p.sighting} />
                  {p.sighting.rsrp_dbm !== null && <span className="text-xs text-ink-500">RSRP {p.sighting.rsrp_dbm} dBm where the surveyor stood</span>}
                </>
              ) : (
                <span className="text-ink-500">not reported</span>
              )}
            </td>
            <td data-label={mastName ? `On ${mastName}` : 'On the mast'}>
              {p.mast ? <CellText c={p.mast} /> : <span className="text-ink-500">{mastCells ? 'new on this mast' : '—'}</span>}
              {p.shared && <span className="mt-1 inline-block rounded bg-moss-100 px-1.5 text-xs font-semibold text-moss-700">Same cell</span>}
            </td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}
