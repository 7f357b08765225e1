// Addresses of the layer exports (GET /api/export/:layer.:format): plain links the browser downloads.
import { queryString } from './api';
import type { ExportFormat, ExportLayer } from '../schemas/exports';

export interface ExportFilter {
  region?: string;
  operators?: readonly string[];
  techs?: readonly string[];
  bands?: readonly string[];
  /** Only when some statuses are left out: none given means every status. */
  statuses?: readonly string[];
}

/** One operator, and one of its bands, when exactly one of each is chosen: the hexagons are kept so. */
function hexagonFilter(filter: ExportFilter): { operator?: string; band?: string } {
  if (filter.operators?.length !== 1) return {};
  return { operator: filter.operators[0], band: filter.bands?.length === 1 ? filter.bands[0] : undefined };
}

export function getExportUrl(layer: ExportLayer, format: ExportFormat, filter: ExportFilter = {}): string {
  const q = queryString({
    region: filter.region,
    // The hexagons are kept per operator and band, not per technology or mast status.
    ...(layer === 'readings-hexagons'
      ? hexagonFilter(filter)
      : { operator: filter.operators, tech: filter.techs, band: filter.bands, status: filter.statuses }),
  });
  return `/api/export/${layer}.${format}${q ? `?${q}` : ''}`;
}
