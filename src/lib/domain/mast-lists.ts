// The fixed lists of the mast map: statuses, structure types and radio technologies, with the
// words shown for them (no schema library here, so pages that only show them load little).
import type { RadioTech } from './channels';

export const MAST_STATUSES = ['active', 'planned', 'decommissioned'] as const;
export type MastStatus = (typeof MAST_STATUSES)[number];
export const MAST_STATUS_LABELS: Record<MastStatus, string> = {
  active: 'Active',
  planned: 'Planned',
  decommissioned: 'Decommissioned',
};

export const STRUCTURE_TYPES = ['lattice_tower', 'monopole', 'guyed_mast', 'rooftop', 'pole', 'water_tower', 'other'] as const;
export type StructureType = (typeof STRUCTURE_TYPES)[number];
export const STRUCTURE_TYPE_LABELS: Record<StructureType, string> = {
  lattice_tower: 'Lattice tower',
  monopole: 'Monopole',
  guyed_mast: 'Guyed mast',
  rooftop: 'Rooftop',
  pole: 'Pole',
  water_tower: 'Water tower',
  other: 'Other',
};

/** Technologies in display order (oldest first). */
export const TECHS = ['gsm', 'umts', 'lte', 'nr'] as const satisfies readonly RadioTech[];
export type Tech = (typeof TECHS)[number];
