// The fixed lists of the mast map: statuses, structure types and radio technologies, with the
// words shown for them (no schema library here, so pages that only show them load little).
import type { RadioTech } from './channels';
import { defineChoices, type Choice } from './choices';

export const MAST_STATUS = defineChoices({ active: 'Active', planned: 'Planned', decommissioned: 'Decommissioned' });
export const { values: MAST_STATUSES, labels: MAST_STATUS_LABELS } = MAST_STATUS;
export type MastStatus = Choice<typeof MAST_STATUS>;

export const STRUCTURE_TYPE = defineChoices({
  lattice_tower: 'Lattice tower',
  monopole: 'Monopole',
  guyed_mast: 'Guyed mast',
  rooftop: 'Rooftop',
  pole: 'Pole',
  water_tower: 'Water tower',
  other: 'Other',
});
export const { values: STRUCTURE_TYPES, labels: STRUCTURE_TYPE_LABELS } = STRUCTURE_TYPE;
export type StructureType = Choice<typeof STRUCTURE_TYPE>;

/** Technologies in display order (oldest first). */
export const TECHS = ['gsm', 'umts', 'lte', 'nr'] as const satisfies readonly RadioTech[];
export type Tech = (typeof TECHS)[number];
