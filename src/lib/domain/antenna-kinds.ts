// The kinds of customer antenna the catalogue knows, with their labels (no schema library here, so
// pages that only show them load little).
export const ANTENNA_KINDS = ['directional', 'omni', 'stub'] as const;
export type AntennaKind = (typeof ANTENNA_KINDS)[number];
export const ANTENNA_KIND_LABELS: Record<AntennaKind, string> = {
  directional: 'Directional',
  omni: 'Omni',
  stub: 'Stub / whip',
};
