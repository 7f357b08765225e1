// The kinds of customer antenna the catalogue knows, with their labels (no schema library here, so
// pages that only show them load little).
import { defineChoices, type Choice } from './choices';

export const ANTENNA_KIND = defineChoices({ directional: 'Directional', omni: 'Omni', stub: 'Stub / whip' });
export const { values: ANTENNA_KINDS, labels: ANTENNA_KIND_LABELS } = ANTENNA_KIND;
export type AntennaKind = Choice<typeof ANTENNA_KIND>;
