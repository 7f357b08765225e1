// The fixed lists of the mast map (lib/domain/mast-lists.ts) and their request schemas.
import { enumOf } from './params';
import { MAST_STATUSES, STRUCTURE_TYPES, TECHS } from '../domain/mast-lists';

export {
  MAST_STATUSES,
  MAST_STATUS_LABELS,
  STRUCTURE_TYPES,
  STRUCTURE_TYPE_LABELS,
  TECHS,
  type MastStatus,
  type StructureType,
  type Tech,
} from '../domain/mast-lists';

export const MastStatusSchema = enumOf(MAST_STATUSES);
export const StructureTypeSchema = enumOf(STRUCTURE_TYPES);
export const TechSchema = enumOf(TECHS);
