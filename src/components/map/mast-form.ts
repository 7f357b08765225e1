// The mast form's text fields and what they become in an API body. Pure: the create and edit
// forms use these, and the same schemas as the API check the result before it is sent.
import type { MastBody } from '../../lib/client/masts-api';
import type { MastDetailJson } from '../../lib/schemas/mast-responses';
import type { MastStatus, StructureType } from '../../lib/schemas/mast-enums';

export type MastDraft = Record<'name' | 'reference' | 'structure_height_m' | 'ground_elevation_m' | 'lat' | 'lon' | 'access_notes', string> & {
  status: MastStatus;
  structure_type: StructureType;
};

const TEXT_KEYS = ['name', 'reference', 'status', 'structure_type', 'access_notes'] as const;
const NULLABLE_NUMBER_KEYS = ['structure_height_m', 'ground_elevation_m'] as const;

const numText = (v: number | null) => (v === null ? '' : String(v));

/** A new mast at a clicked position (6 decimals: about 0.1 m). */
export function newMastDraft(lat: number, lon: number): MastDraft {
  return {
    name: '',
    reference: '',
    status: 'active',
    structure_type: 'other',
    structure_height_m: '',
    ground_elevation_m: '',
    lat: lat.toFixed(6),
    lon: lon.toFixed(6),
    access_notes: '',
  };
}

export function mastDraftOf(m: MastDetailJson): MastDraft {
  return {
    name: m.name,
    reference: m.reference ?? '',
    status: m.status,
    structure_type: m.structure_type,
    structure_height_m: numText(m.structure_height_m),
    ground_elevation_m: numText(m.ground_elevation_m),
    lat: m.lat.toFixed(6),
    lon: m.lon.toFixed(6),
    access_notes: m.access_notes ?? '',
  };
}

/**
 * A number field's text as the API wants it: a decimal comma is read as a point; blank means "not
 * known" where that is allowed, else it is left out so that the schema answers "required". Text
 * that is not a number is passed on as text, so that the schema answers "must be a number".
 */
export function readNumber(text: string, nullable: boolean): number | string | null | undefined {
  const t = text.trim().replace(',', '.');
  if (t === '') return nullable ? null : undefined;
  return /^-?(\d+\.?\d*|\.\d+)$/.test(t) ? Number(t) : text;
}

/** The body of POST /api/masts. */
export function mastInputOf(d: MastDraft): MastBody {
  // As typed; MastInputSchema checks it before it is sent.
  return {
    name: d.name,
    reference: d.reference.trim() === '' ? null : d.reference,
    status: d.status,
    structure_type: d.structure_type,
    structure_height_m: readNumber(d.structure_height_m, true),
    ground_elevation_m: readNumber(d.ground_elevation_m, true),
    lat: readNumber(d.lat, false),
    lon: readNumber(d.lon, false),
    access_notes: d.access_notes.trim() === '' ? null : d.access_notes,
  } as MastBody;
}

/** The fields that differ from the stored mast, in the API's names (lat and lon go together). */
export function changedMastFields(before: MastDraft, after: MastDraft): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const k of TEXT_KEYS) if (after[k] !== before[k]) out[k] = after[k].trim() === '' && k !== 'name' ? null : after[k];
  for (const k of NULLABLE_NUMBER_KEYS) if (after[k] !== before[k]) out[k] = readNumber(after[k], true);
  if (after.lat !== before.lat || after.lon !== before.lon) {
    out.lat = readNumber(after.lat, false);
    out.lon = readNumber(after.lon, false);
  }
  return out;
}
