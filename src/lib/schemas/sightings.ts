// Sightings: a field report of a mast, pending review. The input schema is shared by the form on
// the phone and the endpoint; the JSON shapes are what the API returns.
import { z } from 'zod';
import { getMeasurementRange, type MeasurementKind } from '../domain/measurements';
import { AzimuthSchema, ChannelSchema, LatSchema, LonSchema, OperatorIdSchema, PciSchema } from './masts';
import { BboxSchema } from './mast-query';
import { TechSchema, type Tech } from './mast-enums';
import { checkRadio } from './radio';
import { type OperatorRefJson } from './mast-responses';
import { enumOf, idParam, numberField, optionalText, pageParams } from './params';

export const SIGHTING_STATUSES = ['pending', 'approved', 'merged', 'rejected'] as const;
export type SightingStatus = (typeof SIGHTING_STATUSES)[number];
export const SIGHTING_STATUS_LABELS: Record<SightingStatus, string> = {
  pending: 'Waiting for review',
  approved: 'Approved as a new mast',
  merged: 'Merged into a mast',
  rejected: 'Rejected',
};

/** The structures a surveyor chooses from (a subset of the mast structure types). */
export const SIGHTING_STRUCTURE_TYPES = ['lattice_tower', 'monopole', 'rooftop', 'water_tower', 'other'] as const;
export type SightingStructureType = (typeof SIGHTING_STRUCTURE_TYPES)[number];
export const SIGHTING_STRUCTURE_LABELS: Record<SightingStructureType, string> = {
  lattice_tower: 'Lattice tower',
  monopole: 'Monopole',
  rooftop: 'Rooftop',
  water_tower: 'Water tower',
  other: 'Other',
};

/** Where the position came from: a photo's GPS tags, the device's location, or a click on the map. */
export const POSITION_SOURCES = ['photo', 'device', 'map'] as const;
export type PositionSource = (typeof POSITION_SOURCES)[number];

export const MAX_SIGHTING_PHOTOS = 6;
/** Per photo, as uploaded: a phone's full-resolution JPEG is 3–12 MB (common practice). */
export const MAX_PHOTO_BYTES = 15 * 1024 * 1024;
export const PHOTO_MIME_TYPES = ['image/jpeg', 'image/png', 'image/webp'] as const;
export type PhotoMime = (typeof PHOTO_MIME_TYPES)[number];
export const MAX_SIGHTING_CELLS = 24;
export const MAX_SIGHTING_OPERATORS = 12;

// --- Input -------------------------------------------------------------------------------------

const num = (label: string) => numberField(label, `${label} must be a number`);

/** Which measured quantity each reading field is for a technology; GSM and UMTS report none of them. */
const READING_KINDS: Record<Tech, { rsrp: MeasurementKind; rsrq: MeasurementKind; sinr: MeasurementKind } | null> = {
  lte: { rsrp: 'lteRsrp', rsrq: 'lteRsrq', sinr: 'lteSinr' },
  nr: { rsrp: 'nrSsRsrp', rsrq: 'nrSsRsrq', sinr: 'nrSsSinr' },
  gsm: null,
  umts: null,
};

/** The accepted range of a reading field for a technology (3GPP reporting ranges, measurements.ts), or null. */
export function getReadingRange(tech: Tech, field: 'rsrp' | 'rsrq' | 'sinr'): { min: number; max: number; unit: string } | null {
  const kinds = READING_KINDS[tech];
  if (!kinds) return null;
  const r = getMeasurementRange(kinds[field]);
  return { min: r.min, max: r.max, unit: r.unit };
}

const READING_FIELDS = [
  ['rsrp_dbm', 'rsrp', 'RSRP'],
  ['rsrq_db', 'rsrq', 'RSRQ'],
  ['sinr_db', 'sinr', 'SINR'],
] as const;

const sightingCellFields = {
  operator_id: OperatorIdSchema,
  tech: TechSchema,
  band: z.string().trim().max(20, 'At most 20 characters').nullish(),
  channel: ChannelSchema,
  pci: PciSchema,
  sector_azimuth_deg: AzimuthSchema,
  rsrp_dbm: num('RSRP').nullish(),
  rsrq_db: num('RSRQ').nullish(),
  sinr_db: num('SINR').nullish(),
};

export interface SightingCellInput {
  operatorId: string;
  tech: Tech;
  band: string;
  channel: number;
  dlMhz: number;
  pci: number | null;
  sectorAzimuthDeg: number | null;
  rsrpDbm: number | null;
  rsrqDb: number | null;
  sinrDb: number | null;
}

export const SightingCellInputSchema = z.object(sightingCellFields).transform((v, ctx): SightingCellInput => {
  const { band, dlMhz } = checkRadio(v, ctx);
  for (const [key, field, label] of READING_FIELDS) {
    const value = v[key];
    if (value === null || value === undefined) continue;
    const range = getReadingRange(v.tech, field);
    if (!range) ctx.addIssue({ code: 'custom', path: [key], message: `${label} is measured on LTE and NR cells only` });
    else if (value < range.min || value > range.max) {
      ctx.addIssue({ code: 'custom', path: [key], message: `${label} must be ${range.min} … ${range.max} ${range.unit}` });
    }
  }
  return {
    operatorId: v.operator_id,
    tech: v.tech,
    band,
    channel: v.channel,
    dlMhz,
    pci: v.pci ?? null,
    sectorAzimuthDeg: v.sector_azimuth_deg ?? null,
    rsrpDbm: v.rsrp_dbm ?? null,
    rsrqDb: v.rsrq_db ?? null,
    sinrDb: v.sinr_db ?? null,
  };
});

/** Photos may be timestamped a little ahead of the server's clock; more than a day is a wrong date. */
const FUTURE_SLACK_MS = 24 * 3600 * 1000;

export const SightingInputSchema = z
  .object({
    client_uuid: z
      .string({ required_error: 'Required' })
      .uuid('Not a valid UUID')
      .transform((s) => s.toLowerCase()),
    lat: LatSchema,
    lon: LonSchema,
    position_source: enumOf(POSITION_SOURCES),
    position_accuracy_m: num('Accuracy').min(0, 'Cannot be negative').max(100_000, 'At most 100 km').nullish(),
    structure_type: enumOf(SIGHTING_STRUCTURE_TYPES),
    estimated_height_m: num('Height').min(1, 'At least 1 m').max(700, 'At most 700 m').nullish(),
    operator_ids: z
      .array(OperatorIdSchema, { invalid_type_error: 'Must be a list' })
      .max(MAX_SIGHTING_OPERATORS, `At most ${MAX_SIGHTING_OPERATORS} operators`)
      .default([]),
    cells: z
      .array(SightingCellInputSchema, { invalid_type_error: 'Must be a list' })
      .max(MAX_SIGHTING_CELLS, `At most ${MAX_SIGHTING_CELLS} cells`)
      .default([]),
    notes: optionalText(2000),
    observed_at: z.coerce
      .date({ errorMap: () => ({ message: 'Give a date and time' }) })
      .refine((d) => d.getTime() <= Date.now() + FUTURE_SLACK_MS, 'This is in the future')
      .refine((d) => d.getUTCFullYear() >= 2000, 'This is too long ago'),
  })
  .transform((v) => ({
    clientUuid: v.client_uuid,
    lat: v.lat,
    lon: v.lon,
    positionSource: v.position_source,
    positionAccuracyM: v.position_accuracy_m ?? null,
    structureType: v.structure_type,
    estimatedHeightM: v.estimated_height_m ?? null,
    // Operators of the cells count as seen too.
    operatorIds: [...new Set([...v.operator_ids, ...v.cells.map((c) => c.operatorId)])],
    cells: v.cells,
    notes: v.notes,
    observedAt: v.observed_at,
  }));
export type SightingInput = z.output<typeof SightingInputSchema>;
/** What the form sends in the `sighting` part of the multipart body (JSON). */
export type SightingInputJson = z.input<typeof SightingInputSchema>;

export const SightingListQuerySchema = z.object({
  mine: z.enum(['1', 'true'], { errorMap: () => ({ message: 'mine must be 1' }) }).optional(),
  status: enumOf(SIGHTING_STATUSES).optional(),
  ...pageParams,
});

export const SightingIdParamSchema = z.object({ id: idParam });

// --- JSON the API returns ------------------------------------------------------------------------

export interface UserRefJson {
  id: string;
  name: string;
}

export interface SightingCellJson {
  id: string;
  operator: OperatorRefJson;
  tech: Tech;
  band: string;
  channel: number;
  dl_mhz: number | null;
  pci: number | null;
  sector_azimuth_deg: number | null;
  rsrp_dbm: number | null;
  rsrq_db: number | null;
  sinr_db: number | null;
}

export interface SightingPhotoJson {
  id: string;
  sha256: string;
  mime: PhotoMime;
  byte_size: number;
  width: number;
  height: number;
  taken_at: string | null;
  /** Re-encoded without metadata. */
  display_url: string;
  thumb_url: string;
  /** The file as uploaded, with its metadata; only reviewers and admins are given it. */
  original_url: string | null;
}

export interface SightingJson {
  id: string;
  client_uuid: string;
  status: SightingStatus;
  author: UserRefJson;
  lat: number;
  lon: number;
  position_source: PositionSource;
  position_accuracy_m: number | null;
  structure_type: SightingStructureType;
  estimated_height_m: number | null;
  operators: OperatorRefJson[];
  cells: SightingCellJson[];
  photos: SightingPhotoJson[];
  notes: string | null;
  observed_at: string;
  created_at: string;
  decided_by: UserRefJson | null;
  decided_at: string | null;
  decision_reason: string | null;
  mast_id: string | null;
}

export interface SightingCreatedJson {
  id: string;
  status: SightingStatus;
}

export interface SightingListJson {
  items: SightingJson[];
  total: number;
}

/** A pending sighting on the map (GeoJSON, lon before lat). */
export interface PendingSightingFeatureJson {
  type: 'Feature';
  id: number;
  geometry: { type: 'Point'; coordinates: [number, number] };
  properties: { id: string; structure_type: SightingStructureType; author_name: string; observed_at: string; mine: boolean };
}

export interface PendingSightingCollectionJson {
  type: 'FeatureCollection';
  features: PendingSightingFeatureJson[];
}

/** Surveys of a mast: the photos and people of its approved or merged sightings. */
export interface MastSurveyJson {
  surveyors: Array<UserRefJson & { last_observed_at: string }>;
  last_observed_at: string | null;
  photos: Array<SightingPhotoJson & { sighting_id: string }>;
}

export const PHOTO_VARIANTS = ['display', 'thumb', 'original'] as const;
export type PhotoVariant = (typeof PHOTO_VARIANTS)[number];

export const PhotoParamsSchema = z.object({ id: idParam, variant: enumOf(PHOTO_VARIANTS) });

export const PendingSightingQuerySchema = z.object({ bbox: BboxSchema.optional() });
