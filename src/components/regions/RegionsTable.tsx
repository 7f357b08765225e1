// The regions with their key counts (drawn on the server: no script).
import type { RegionCountsJson } from '../../lib/schemas/region-summary';
import { formatCount, formatNumber } from '../../lib/domain/format';
import { DataTable, FIGURES, type TableColumn } from '../ui/DataTable';

/** Caption, place on the page and test id of the table. */
const FRAME = { caption: 'Regions with their key counts', className: 'mt-4 max-w-4xl bg-white', testId: 'regions-table' };

export default function RegionsTable({ regions, seesCustomers }: { regions: RegionCountsJson[]; seesCustomers: boolean }) {
  const columns: TableColumn<RegionCountsJson>[] = [
    {
      key: 'name',
      label: 'Region',
      render: (r) => (
        <a href={`/regions/${r.id}`} className="font-semibold text-ink-800 underline">
          {r.name}
        </a>
      ),
    },
    { key: 'area', label: 'Area km²', className: FIGURES, render: (r) => formatNumber(r.area_km2, 1) },
    { key: 'masts', label: 'Masts', className: FIGURES, render: (r) => formatCount(r.masts) },
    { key: 'cells', label: 'Cells', className: FIGURES, render: (r) => formatCount(r.cells) },
    { key: 'readings', label: 'Readings', className: FIGURES, render: (r) => formatCount(r.readings) },
  ];
  if (seesCustomers) columns.push({ key: 'customers', label: 'Customers', className: FIGURES, render: (r) => formatCount(r.customers ?? 0) });
  return <DataTable rows={regions} columns={columns} rowKey={(r) => r.id} rowTestId={(r) => `region-row-${r.id}`} {...FRAME} />;
}
