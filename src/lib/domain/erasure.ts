/**
 * Erasing one customer's personal data on their request while keeping the team's non-personal
 * history: plans keep their state, cell, kit and radio figures, but nothing that names the
 * customer or places their home (a position, or a distance and bearing from a known mast, which
 * would give the position back).
 */

/** Fields of a customer record (and of its audit entries) that identify the person or their home. */
export const PERSONAL_CUSTOMER_FIELDS = ['name', 'phone', 'email', 'address_label', 'postcode', 'lat', 'lon', 'notes'] as const;

/** Free-text fields of plans and install checks (they may quote the customer). */
export const PERSONAL_PLAN_FIELDS = ['notes'] as const;

/**
 * Shortlist figures a plan keeps after erasure: which cell and operator, the radio figures and the
 * grade. Distance, bearings, elevation angle, path loss, the terrain profile's distances and the
 * customer's position are dropped: with the mast's position they locate the home.
 */
const KEPT_FIGURES = [
  'rank',
  'cell_id',
  'operator',
  'tech',
  'band',
  'channel',
  'freq_mhz',
  'pci',
  'antenna_height_m',
  'predicted_rsrp_dbm',
  'expected_gain_db',
  'grade',
  'calibration',
] as const;

export function getAnonymisedFigures(figures: Record<string, unknown>): Record<string, unknown> {
  const kept: Record<string, unknown> = {};
  for (const key of KEPT_FIGURES) if (key in figures) kept[key] = figures[key];
  const mast = figures.mast;
  if (mast && typeof mast === 'object' && 'id' in mast) {
    const { id, name } = mast as { id: unknown; name?: unknown };
    kept.mast = { id, name };
  }
  return kept;
}

/** Decimal places a position keeps after erasure: 0.1° is about 11 km north–south (common practice
 * for publishing coarse locations), enough for regional statistics, not enough to find a home. */
export const ERASED_POSITION_DECIMALS = 1;

export function getCoarsePosition(at: { lat: number; lon: number }): { lat: number; lon: number } {
  const f = 10 ** ERASED_POSITION_DECIMALS;
  return { lat: Math.round(at.lat * f) / f, lon: Math.round(at.lon * f) / f };
}

/**
 * An audit entry's before/after with the personal fields replaced by `null` and plan figures
 * anonymised, at any depth. Keys not listed are kept as they are.
 */
export function getScrubbedAuditValue(value: unknown, personal: readonly string[]): unknown {
  if (Array.isArray(value)) return value.map((v) => getScrubbedAuditValue(v, personal));
  if (value === null || typeof value !== 'object') return value;
  const out: Record<string, unknown> = {};
  for (const [key, v] of Object.entries(value)) {
    if (personal.includes(key)) out[key] = null;
    else if (key === 'figures' && v && typeof v === 'object' && !Array.isArray(v)) out[key] = getAnonymisedFigures(v as Record<string, unknown>);
    else out[key] = getScrubbedAuditValue(v, personal);
  }
  return out;
}

export const getErasedName = (customerId: string) => `Erased customer ${customerId}`;
export const ERASED_ADDRESS_LABEL = 'Erased on request';
