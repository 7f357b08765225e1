// Sightings: a field report of a mast, pending review. One field declaration each for the sighting,
// the cells seen (the cell declaration's own fields) and the photos; the input schema derived from
// it is shared by the form on the phone and the endpoint, and the JSON is what the API returns.
import { z } from 'zod';
import { getMeasurementRange, type MeasurementKind } from '../domain/measurements';
import { CELL, CELL_RADIO, LatSchema, LonSchema, OperatorIdSchema, type OperatorRef } from './masts';
import { BboxSchema } from './mast-query';
import { type Tech } from './mast-enums';
import { STRUCTURE_TYPE } from '../domain/mast-lists';
import { defineChoices, type Choice } from '../domain/choices';
import { checkRadio } from './radio';
import { enumOf, idParam, numberField, optionalText, pageParams } from './params';
import { defineRecord, field, orNull, type InputOf, type JsonOf, type ValueOf } from './record';

export const SIGHTING_STATUS = defineChoices({
  pending: 'Waiting for review',
  approved: 'Approved as a new mast',
  merged: 'Merged into a mast',
  rejected: 'Rejected',
});
export const { values: SIGHTING_STATUSES, labels: SIGHTING_STATUS_LABELS } = SIGHTING_STATUS;
export type SightingStatus = Choice<typeof SIGHTING_STATUS>;

/** The structures a surveyor chooses from (a subset of the mast structure types, with the mast's own words). */
export const SIGHTING_STRUCTURE = STRUCTURE_TYPE.pick(['lattice_tower', 'monopole', 'rooftop', 'water_tower', 'other']);
export const { values: SIGHTING_STRUCTURE_TYPES, labels: SIGHTING_STRUCTURE_LABELS } = SIGHTING_STRUCTURE;
export type SightingStructureType = Choice<typeof SIGHTING_STRUCTURE>;

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

/** A cell seen in a sighting: the cell declaration's fields and what the surveyor measured. Selected with its operator joined as `o`. */
export const SIGHTING_CELL = defineRecord({
  id: CELL.fields.id,
  operator_id: CELL.fields.operator_id,
  operator: CELL.fields.operator,
  ...CELL_RADIO,
  rsrp_dbm: field.input(num('RSRP').nullish().transform(orNull)),
  rsrq_db: field.input(num('RSRQ').nullish().transform(orNull)),
  sinr_db: field.input(num('SINR').nullish().transform(orNull)),
});

export type SightingCell = ValueOf<typeof SIGHTING_CELL.fields>;
export type SightingCellJson = JsonOf<typeof SIGHTING_CELL.fields>;
/** A checked cell: the band resolved and its downlink frequency (NaN when the channel is in no band). */
export type SightingCellInput = Omit<InputOf<typeof SIGHTING_CELL.fields>, 'band'> & { band: string; dlMhz: number };

export const SightingCellInputSchema = z.object(SIGHTING_CELL.inputShape).transform((v, ctx): SightingCellInput => {
  const radio = checkRadio(v, ctx);
  for (const [key, field, label] of READING_FIELDS) {
    const value = v[key];
    if (value === null || value === undefined) continue;
    const range = getReadingRange(v.tech, field);
    if (!range) ctx.addIssue({ code: 'custom', path: [key], message: `${label} is measured on LTE and NR cells only` });
    else if (value < range.min || value > range.max) {
      ctx.addIssue({ code: 'custom', path: [key], message: `${label} must be ${range.min} … ${range.max} ${range.unit}` });
    }
  }
  return { ...SIGHTING_CELL.toInput(v), ...radio };
});

export const PHOTO_URL_PREFIX = '/api/sightings/photos';

/** A stored photo of a sighting: the file's facts and its keys in the photo storage (not shown). */
export const SIGHTING_PHOTO = defineRecord({
  id: field.id(),
  sighting_id: field.id({ json: false }),
  sha256: field.value<string>({ write: true }),
  mime: field.value<PhotoMime>({ write: true }),
  byte_size: field.value<number>({ write: true, fromRow: Number }),
  width: field.value<number>({ write: true }),
  height: field.value<number>({ write: true }),
  original_name: field.value<string | null>({ write: true, json: false }),
  original_key: field.value<string>({ write: true, json: false }),
  display_key: field.value<string>({ write: true, json: false }),
  thumb_key: field.value<string>({ write: true, json: false }),
  gps_lat: field.value<number | null>({ write: true, json: false }),
  gps_lon: field.value<number | null>({ write: true, json: false }),
  taken_at: field.maybeTime({ write: true }),
  created_at: field.time({ json: false }),
});

export type SightingPhoto = ValueOf<typeof SIGHTING_PHOTO.fields>;
/** A photo stored before its sighting is written (keys into the photo storage). */
export type NewSightingPhoto = Omit<SightingPhoto, 'id' | 'sightingId' | 'createdAt'>;
/** The keys of the photo storage and the file's metadata stay on the server (`json: false`). */
export type SightingPhotoJson = JsonOf<typeof SIGHTING_PHOTO.fields> & {
  /** Re-encoded without metadata. */
  display_url: string;
  thumb_url: string;
  /** The file as uploaded, with its metadata; only reviewers and admins are given it. */
  original_url: string | null;
};

export function photoJson(p: SightingPhoto, withOriginal: boolean): SightingPhotoJson {
  return {
    ...SIGHTING_PHOTO.toJson(p),
    display_url: `${PHOTO_URL_PREFIX}/${p.id}/display`,
    thumb_url: `${PHOTO_URL_PREFIX}/${p.id}/thumb`,
    original_url: withOriginal ? `${PHOTO_URL_PREFIX}/${p.id}/original` : null,
  };
}

export interface UserRefJson {
  id: string;
  name: string;
}
export type UserRef = UserRefJson;

/** Child rows as one JSON list in id order (`{t}` is the sighting). */
const listOf = (object: string, from: string, order: string) => `(SELECT coalesce(json_agg(${object} ORDER BY ${order}), '[]'::json) FROM ${from})`;

/** Photos may be timestamped a little ahead of the server's clock; more than a day is a wrong date. */
const FUTURE_SLACK_MS = 24 * 3600 * 1000;

/**
 * A sighting, field by field: body and JSON name (= column), how it is written and read. Selected
 * with its author joined as `a` and the reviewer who decided it as `d`.
 */
export const SIGHTING = defineRecord({
  id: field.id(),
  client_uuid: field.input(
    z
      .string({ required_error: 'Required' })
      .uuid('Not a valid UUID')
      .transform((s) => s.toLowerCase()),
  ),
  status: field.value<SightingStatus>({ audit: true }),
  author: field.value<UserRef>({ sql: "json_build_object('id', {t}.author_id::text, 'name', a.name)" }),
  // The position is stored as one point (`geom`): the repo writes it from lat and lon together.
  lat: field.input(LatSchema, { column: false, sql: 'ST_Y({t}.geom::geometry)' }),
  lon: field.input(LonSchema, { column: false, sql: 'ST_X({t}.geom::geometry)' }),
  position_source: field.input(enumOf(POSITION_SOURCES)),
  position_accuracy_m: field.input(num('Accuracy').min(0, 'Cannot be negative').max(100_000, 'At most 100 km').nullish().transform(orNull), {
    audit: false,
  }),
  structure_type: field.input(enumOf(SIGHTING_STRUCTURE_TYPES)),
  estimated_height_m: field.input(num('Height').min(1, 'At least 1 m').max(700, 'At most 700 m').nullish().transform(orNull)),
  // Written by the repo from `operator_ids` and the cells' operators.
  operators: field.value<OperatorRef[]>({
    sql: listOf(
      "json_build_object('id', o.id::text, 'name', o.name, 'colour', o.colour)",
      'sighting_operators so JOIN operators o ON o.id = so.operator_id WHERE so.sighting_id = {t}.id',
      'o.id',
    ),
  }),
  cells: field.input(
    z.array(SightingCellInputSchema, { invalid_type_error: 'Must be a list' }).max(MAX_SIGHTING_CELLS, `At most ${MAX_SIGHTING_CELLS} cells`).default([]),
    {
      column: false,
      sql: listOf(SIGHTING_CELL.objectSql('c'), 'sighting_cells c JOIN operators o ON o.id = c.operator_id WHERE c.sighting_id = {t}.id', 'c.id'),
      fromRow: (v) => (v as Record<string, unknown>[]).map((c) => SIGHTING_CELL.fromRow(c)),
      toJson: (cells: SightingCell[]) => cells.map((c) => SIGHTING_CELL.toJson(c)),
    },
  ),
  // Uploaded with the sighting and stored before it (photos.ts); originals are linked for reviewers only (sightingJson).
  photos: field.value<SightingPhoto[], SightingPhotoJson[]>({
    sql: listOf(SIGHTING_PHOTO.objectSql('ph'), 'sighting_photos ph WHERE ph.sighting_id = {t}.id', 'ph.id'),
    fromRow: (v) => (v as Record<string, unknown>[]).map((p) => SIGHTING_PHOTO.fromRow(p)),
    toJson: (photos) => photos.map((p) => photoJson(p, false)),
  }),
  notes: field.input(optionalText(2000)),
  observed_at: field.input(
    z.coerce
      .date({ errorMap: () => ({ message: 'Give a date and time' }) })
      .refine((d) => d.getTime() <= Date.now() + FUTURE_SLACK_MS, 'This is in the future')
      .refine((d) => d.getUTCFullYear() >= 2000, 'This is too long ago'),
    { toJson: (d: Date) => d.toISOString() },
  ),
  created_at: field.time(),
  decided_by: field.value<UserRef | null>({
    audit: true,
    sql: "CASE WHEN {t}.decided_by IS NULL THEN NULL ELSE json_build_object('id', {t}.decided_by::text, 'name', coalesce(d.name, '')) END",
  }),
  decided_at: field.maybeTime({ audit: true }),
  decision_reason: field.value<string | null>({ audit: true }),
  mast_id: field.ref({ audit: true }),
});

export type Sighting = ValueOf<typeof SIGHTING.fields>;
export type SightingJson = JsonOf<typeof SIGHTING.fields>;

/** `withOriginals`: link the photos as uploaded (reviewers and admins only). */
export function sightingJson(s: Sighting, options: { withOriginals: boolean }): SightingJson {
  return { ...SIGHTING.toJson(s), photos: s.photos.map((p) => photoJson(p, options.withOriginals)) };
}

/** What the audit trail keeps of a sighting: its audited fields, the operators, cells, photos and reviewer by what identifies them. */
export function sightingAuditView(s: Sighting) {
  return {
    ...SIGHTING.auditView(s),
    operator_ids: s.operators.map((o) => o.id),
    cells: s.cells.map((c) => ({ operator_id: c.operator.id, tech: c.tech, band: c.band, channel: c.channel, pci: c.pci })),
    photos: s.photos.map((p) => p.sha256),
    decided_by: s.decidedBy?.id ?? null,
  };
}

export const SightingInputSchema = z
  .object({
    ...SIGHTING.inputShape,
    operator_ids: z
      .array(OperatorIdSchema, { invalid_type_error: 'Must be a list' })
      .max(MAX_SIGHTING_OPERATORS, `At most ${MAX_SIGHTING_OPERATORS} operators`)
      .default([]),
  })
  .transform((v) => ({
    ...SIGHTING.toInput(v),
    // Operators of the cells count as seen too.
    operatorIds: [...new Set([...v.operator_ids, ...v.cells.map((c) => c.operatorId)])],
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

export interface MastSurveys {
  surveyors: Array<UserRef & { lastObservedAt: Date }>;
  lastObservedAt: Date | null;
  photos: SightingPhoto[];
}

export function mastSurveyJson(m: MastSurveys, options: { withOriginals: boolean }): MastSurveyJson {
  return {
    surveyors: m.surveyors.map((u) => ({ id: u.id, name: u.name, last_observed_at: u.lastObservedAt.toISOString() })),
    last_observed_at: m.lastObservedAt ? m.lastObservedAt.toISOString() : null,
    photos: m.photos.map((p) => ({ ...photoJson(p, options.withOriginals), sighting_id: p.sightingId })),
  };
}

/** A pending sighting as the map shows it. */
export interface PendingSighting {
  id: string;
  structureType: SightingStructureType;
  authorId: string;
  authorName: string;
  observedAt: Date;
  lat: number;
  lon: number;
}

export function pendingSightingsJson(rows: PendingSighting[], viewerId: string): PendingSightingCollectionJson {
  return {
    type: 'FeatureCollection',
    features: rows.map((r) => ({
      type: 'Feature',
      id: Number(r.id),
      geometry: { type: 'Point', coordinates: [r.lon, r.lat] },
      properties: {
        id: r.id,
        structure_type: r.structureType,
        author_name: r.authorName,
        observed_at: r.observedAt.toISOString(),
        mine: r.authorId === viewerId,
      },
    })),
  };
}

export const PHOTO_VARIANTS = ['display', 'thumb', 'original'] as const;
export type PhotoVariant = (typeof PHOTO_VARIANTS)[number];

export const PhotoParamsSchema = z.object({ id: idParam, variant: enumOf(PHOTO_VARIANTS) });

export const PendingSightingQuerySchema = z.object({ bbox: BboxSchema.optional() });
