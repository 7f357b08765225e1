// Masts and their cells: query and input schemas (shared by endpoints and forms) and the JSON
// shapes the API returns. Channel and PCI checks use the 3GPP tables in lib/domain/channels.ts.
import { z } from 'zod';
import { getBand, isChannelInBand, isKnownBand, lookupChannel, type RadioTech } from '../domain/channels';
import {
  ID_PATTERN,
  INT4_MAX,
  dateTimeField,
  enumOf,
  hasChange,
  intParam,
  numberField,
  optionalText,
  requiredText,
  RowVersionSchema,
  textField,
} from './params';

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

/**
 * PCI ranges: LTE 0–503 (TS 36.211 §6.11), NR 0–1007 (TS 38.211 §7.4.2.1); UMTS primary scrambling
 * code 0–511 (TS 25.213 — from memory, verify). GSM has no PCI.
 */
export const PCI_MAX: Record<Tech, number | null> = { lte: 503, nr: 1007, umts: 511, gsm: null };

export const MastStatusSchema = enumOf(MAST_STATUSES);
export const StructureTypeSchema = enumOf(STRUCTURE_TYPES);
export const TechSchema = enumOf(TECHS);

const num = (label: string) => numberField(label, `${label} must be a number`);

export const LatSchema = num('Latitude').min(-90, 'Latitude must be between −90 and 90').max(90, 'Latitude must be between −90 and 90');
export const LonSchema = num('Longitude').min(-180, 'Longitude must be between −180 and 180').max(180, 'Longitude must be between −180 and 180');

// --- Query strings ---------------------------------------------------------------------------

export interface Bbox {
  minLon: number;
  minLat: number;
  maxLon: number;
  maxLat: number;
}

/** `minLon,minLat,maxLon,maxLat` in WGS84 degrees (the order of RFC 7946 §5). */
export const BboxSchema = z.string().transform((text, ctx): Bbox => {
  const parts = text.split(',').map((p) => p.trim());
  const nums = parts.map((p) => (p === '' ? Number.NaN : Number(p)));
  if (parts.length !== 4 || nums.some((n) => !Number.isFinite(n))) {
    ctx.addIssue({ code: 'custom', message: 'Give four numbers: minLon,minLat,maxLon,maxLat' });
    return z.NEVER;
  }
  const [minLon, minLat, maxLon, maxLat] = nums as [number, number, number, number];
  if ([minLon, maxLon].some((v) => v < -180 || v > 180)) ctx.addIssue({ code: 'custom', message: 'Longitudes must be between −180 and 180' });
  if ([minLat, maxLat].some((v) => v < -90 || v > 90)) ctx.addIssue({ code: 'custom', message: 'Latitudes must be between −90 and 90' });
  if (minLon > maxLon || minLat > maxLat) ctx.addIssue({ code: 'custom', message: 'The minimum must not exceed the maximum' });
  return { minLon, minLat, maxLon, maxLat };
});

/** A comma-separated list in a query string; empty items are ignored; errors name the list, not the item. */
const listOf = <T>(item: z.ZodType<T, z.ZodTypeDef, string>, label: string) =>
  z.string().transform((text, ctx): T[] | undefined => {
    const parts = text
      .split(',')
      .map((s) => s.trim())
      .filter(Boolean);
    if (parts.length > 50) {
      ctx.addIssue({ code: 'custom', message: `At most 50 ${label}` });
      return z.NEVER;
    }
    const out: T[] = [];
    for (const part of parts) {
      const r = item.safeParse(part);
      if (r.success) out.push(r.data);
      else for (const issue of r.error.issues) ctx.addIssue({ code: 'custom', message: issue.message });
    }
    return out.length ? out : undefined;
  });

const IdItemSchema = z.string().regex(ID_PATTERN, 'Operator ids are whole numbers');

/** Band label as stored: LTE `B20`, NR `n78`, UMTS `I`/`VIII`, GSM `DCS1800` … (channels.ts). */
export interface BandRef {
  tech: Tech;
  band: string;
}

/** Every technology's band a label may mean: "20" is both LTE B20 and NR n20; "B20" only LTE. */
export function resolveBandLabel(label: string): BandRef[] {
  return TECHS.filter((tech) => isKnownBand(tech, label)).map((tech) => ({ tech, band: getBand(tech, label).band }));
}

const BandItemSchema = z.string().transform((label, ctx) => {
  const refs = resolveBandLabel(label);
  if (refs.length === 0) {
    ctx.addIssue({ code: 'custom', message: `Unknown band '${label}' (e.g. B20, B3, n78)` });
    return z.NEVER;
  }
  return refs;
});

const filterFields = {
  operator: listOf(IdItemSchema, 'operators').optional(),
  band: listOf(BandItemSchema, 'bands').optional(),
  tech: listOf(TechSchema, 'technologies').optional(),
  status: listOf(MastStatusSchema, 'statuses').optional(),
};

/** Filters shared by the mast list and the mast tiles: OR within one list, AND across lists. */
export interface MastFilter {
  operatorIds?: string[];
  bands?: BandRef[];
  techs?: Tech[];
  statuses?: MastStatus[];
}

const toFilter = (q: { operator?: string[]; band?: BandRef[][]; tech?: Tech[]; status?: MastStatus[] }): MastFilter => ({
  operatorIds: q.operator,
  bands: q.band?.flat(),
  techs: q.tech,
  statuses: q.status,
});

export const MastFilterSchema = z.object(filterFields).transform(toFilter);

export const MAST_LIST_LIMIT = 5000;

export const MastListQuerySchema = z
  .object({
    ...filterFields,
    bbox: BboxSchema.optional(),
    limit: intParam('Limit', 1, MAST_LIST_LIMIT, MAST_LIST_LIMIT),
  })
  .transform((q) => ({ bbox: q.bbox, limit: q.limit, ...toFilter(q) }));
export type MastListQuery = z.output<typeof MastListQuerySchema>;

export const MastDeleteQuerySchema = z.object({
  row_version: z
    .string()
    .regex(/^[1-9]\d{0,9}$/, 'Row version must be a whole number')
    .transform(Number)
    .pipe(RowVersionSchema)
    .optional(),
});

// --- Mast input ------------------------------------------------------------------------------

const mastName = requiredText(120);
const reference = optionalText(40);
const groundElevation = num('Ground elevation')
  .min(-500, 'Ground elevation must be at least −500 m')
  .max(9000, 'Ground elevation must be at most 9000 m')
  .nullish();
const structureHeight = num('Structure height').min(0, 'Cannot be negative').max(700, 'Structure height must be at most 700 m').nullish();

export const MastInputSchema = z
  .object({
    name: mastName,
    reference,
    lat: LatSchema,
    lon: LonSchema,
    ground_elevation_m: groundElevation,
    structure_height_m: structureHeight,
    structure_type: StructureTypeSchema.default('other'),
    status: MastStatusSchema.default('active'),
    access_notes: optionalText(2000),
    source: optionalText(60),
  })
  .transform((v) => ({
    name: v.name,
    reference: v.reference,
    lat: v.lat,
    lon: v.lon,
    groundElevationM: v.ground_elevation_m ?? null,
    structureHeightM: v.structure_height_m ?? null,
    structureType: v.structure_type,
    status: v.status,
    accessNotes: v.access_notes,
    source: v.source ?? 'manual',
  }));
export type MastInput = z.output<typeof MastInputSchema>;

export const MastChangeSchema = z
  .object({
    row_version: RowVersionSchema,
    name: mastName.optional(),
    reference: optionalText(40).optional(),
    lat: LatSchema.optional(),
    lon: LonSchema.optional(),
    ground_elevation_m: groundElevation,
    structure_height_m: structureHeight,
    structure_type: StructureTypeSchema.optional(),
    status: MastStatusSchema.optional(),
    access_notes: optionalText(2000).optional(),
    source: optionalText(60).optional(),
  })
  .refine(hasChange, { message: 'Nothing to change' })
  .refine((v) => (v.lat === undefined) === (v.lon === undefined), { message: 'Give lat and lon together', path: ['lat'] })
  .transform((v) => ({
    rowVersion: v.row_version,
    name: v.name,
    reference: v.reference,
    lat: v.lat,
    lon: v.lon,
    groundElevationM: v.ground_elevation_m,
    structureHeightM: v.structure_height_m,
    structureType: v.structure_type,
    status: v.status,
    accessNotes: v.access_notes,
    source: v.source === undefined ? undefined : (v.source ?? 'manual'),
  }));
export type MastChange = z.output<typeof MastChangeSchema>;

// --- Cell input ------------------------------------------------------------------------------

export const OperatorIdSchema = z
  .union([z.number().int().positive().max(Number.MAX_SAFE_INTEGER), z.string().regex(ID_PATTERN)], {
    errorMap: () => ({ message: 'Choose an operator' }),
  })
  .transform(String);
export const ChannelSchema = num('Channel').int('Channel must be a whole number').min(0, 'Channel cannot be negative').max(INT4_MAX, 'Channel is too large');
export const PciSchema = num('PCI').int('PCI must be a whole number').min(0, 'PCI cannot be negative').max(INT4_MAX, 'PCI is too large').nullish();
const cellIdentity = num('Cell identity')
  .int('Cell identity must be a whole number')
  .min(0, 'Cannot be negative')
  .max(2 ** 36 - 1, 'At most 36 bits')
  .nullish();
export const AzimuthSchema = num('Azimuth').min(0, 'Azimuth must be 0–359°').lt(360, 'Azimuth must be 0–359°').nullish();
const antennaHeight = num('Antenna height').min(0, 'Cannot be negative').max(700, 'At most 700 m').nullish();
const bandwidth = num('Bandwidth').gt(0, 'Bandwidth must be above 0').max(400, 'At most 400 MHz').nullish();
const rsPower = num('RS power').min(-20, 'RS power must be at least −20 dBm').max(60, 'RS power must be at most 60 dBm');
// Dates already read from the database come back through here when a change is merged.
const lastObserved = z.preprocess((v) => (v instanceof Date ? v.toISOString() : v), dateTimeField).nullish();

const cellFields = {
  operator_id: OperatorIdSchema,
  tech: TechSchema,
  band: textField(20).nullish(),
  channel: ChannelSchema,
  pci: PciSchema,
  cell_identity: cellIdentity,
  sector_azimuth_deg: AzimuthSchema,
  antenna_height_m: antennaHeight,
  bandwidth_mhz: bandwidth,
  rs_power_dbm: rsPower.default(15.2),
  last_observed_at: lastObserved,
};

export interface CellInput {
  operatorId: string;
  tech: Tech;
  band: string;
  channel: number;
  dlMhz: number;
  pci: number | null;
  cellIdentity: number | null;
  sectorAzimuthDeg: number | null;
  antennaHeightM: number | null;
  bandwidthMhz: number | null;
  rsPowerDbm: number;
  lastObservedAt: Date | null;
}

type CellFields = z.output<z.ZodObject<typeof cellFields>>;

/** Band, channel and PCI as typed; `checkRadio` resolves the band and downlink frequency. */
export interface RadioFields {
  tech: Tech;
  band?: string | null;
  channel: number;
  pci?: number | null;
}

/**
 * The rules that tie a cell's radio fields together: the band must exist for the technology and
 * hold the channel (derived from the channel when not given), and the PCI must be in the
 * technology's range. Shared by mast cells and the cells of a sighting.
 */
export function checkRadio(v: RadioFields, ctx: z.RefinementCtx): { band: string; dlMhz: number } {
  let band: string | null = null;
  let dlMhz = Number.NaN;
  if (v.band) {
    if (!isKnownBand(v.tech, v.band)) {
      ctx.addIssue({ code: 'custom', path: ['band'], message: `Unknown ${v.tech.toUpperCase()} band '${v.band}'` });
    } else if (!isChannelInBand(v.tech, v.channel, v.band)) {
      const b = getBand(v.tech, v.band);
      const ranges = b.dlChannels.map((r) => `${r.first}–${r.last}`).join(', ');
      ctx.addIssue({ code: 'custom', path: ['channel'], message: `Channel ${v.channel} is not in band ${b.band} (downlink ${ranges})` });
    } else {
      band = getBand(v.tech, v.band).band;
      dlMhz = lookupChannel(v.tech, v.channel, { band }).dlMhz;
    }
  } else {
    try {
      const info = lookupChannel(v.tech, v.channel);
      band = info.band;
      dlMhz = info.dlMhz;
    } catch (err) {
      ctx.addIssue({ code: 'custom', path: ['channel'], message: err instanceof Error ? err.message : 'Channel is in no known band' });
    }
  }
  const max = PCI_MAX[v.tech];
  if (v.pci !== null && v.pci !== undefined) {
    if (max === null) ctx.addIssue({ code: 'custom', path: ['pci'], message: 'GSM cells have no PCI' });
    else if (v.pci > max) ctx.addIssue({ code: 'custom', path: ['pci'], message: `${v.tech.toUpperCase()} PCI must be 0–${max}` });
  }
  return { band: band ?? '', dlMhz };
}

function checkCell(v: CellFields, ctx: z.RefinementCtx): CellInput {
  const { band, dlMhz } = checkRadio(v, ctx);
  return {
    operatorId: v.operator_id,
    tech: v.tech,
    band,
    channel: v.channel,
    dlMhz,
    pci: v.pci ?? null,
    cellIdentity: v.cell_identity ?? null,
    sectorAzimuthDeg: v.sector_azimuth_deg ?? null,
    antennaHeightM: v.antenna_height_m ?? null,
    bandwidthMhz: v.bandwidth_mhz ?? null,
    rsPowerDbm: v.rs_power_dbm,
    lastObservedAt: v.last_observed_at ?? null,
  };
}

export const CellInputSchema = z.object(cellFields).transform(checkCell);

/** A partial change; the repo merges it with the stored cell and checks the result with CellInputSchema. */
export const CellChangeSchema = z
  .object({
    ...cellFields,
    operator_id: OperatorIdSchema.optional(),
    tech: TechSchema.optional(),
    channel: ChannelSchema.optional(),
    rs_power_dbm: rsPower.optional(),
    /** The version the change was made from; a stale one is refused with 409. */
    row_version: RowVersionSchema,
  })
  .refine(hasChange, { message: 'Nothing to change' });
/** The API always sends row_version; code inside the server (review merges) may leave it out. */
export type CellChange = Omit<z.output<typeof CellChangeSchema>, 'row_version'> & { row_version?: number };

// --- JSON the API returns ----------------------------------------------------------------------

export interface OperatorRefJson {
  id: string;
  name: string;
  colour: string;
}

export interface MastFeatureProperties {
  id: string;
  name: string;
  reference: string | null;
  status: MastStatus;
  structure_type: StructureType;
  operators: OperatorRefJson[];
  /** Band labels, lowest downlink frequency first (e.g. ["B20", "B3", "n78"]). */
  bands: string[];
  techs: Tech[];
  cell_count: number;
}

export interface MastFeatureJson {
  type: 'Feature';
  /** Numeric, so that map libraries can key feature state on it. */
  id: number;
  geometry: { type: 'Point'; coordinates: [number, number] };
  properties: MastFeatureProperties;
}

export interface MastFeatureCollectionJson {
  type: 'FeatureCollection';
  features: MastFeatureJson[];
  /** True when more masts matched than `limit`; zoom in or filter. (A foreign member, RFC 7946 §6.1.) */
  truncated: boolean;
}

export interface CellJson {
  id: string;
  mast_id: string;
  operator: OperatorRefJson;
  tech: Tech;
  band: string;
  channel: number;
  dl_mhz: number | null;
  pci: number | null;
  cell_identity: number | null;
  sector_azimuth_deg: number | null;
  antenna_height_m: number | null;
  bandwidth_mhz: number | null;
  rs_power_dbm: number;
  last_observed_at: string | null;
  row_version: number;
  created_at: string;
  updated_at: string;
}

export interface ReadingJson {
  id: string;
  taken_at: string;
  lat: number;
  lon: number;
  tech: Tech;
  channel: number | null;
  pci: number | null;
  rsrp_dbm: number | null;
  rsrq_db: number | null;
  sinr_db: number | null;
  rssi_dbm: number | null;
  cell_id: string | null;
  device: string | null;
  source: string | null;
}

export interface MastJson {
  id: string;
  name: string;
  reference: string | null;
  lat: number;
  lon: number;
  ground_elevation_m: number | null;
  structure_height_m: number | null;
  structure_type: StructureType;
  status: MastStatus;
  access_notes: string | null;
  source: string;
  created_by: string | null;
  updated_by: string | null;
  created_at: string;
  updated_at: string;
  row_version: number;
}

export interface MastDetailJson extends MastJson {
  operators: OperatorRefJson[];
  cells: CellJson[];
  recent_readings: ReadingJson[];
}

export interface SearchHitJson {
  kind: 'mast' | 'place';
  id: string;
  name: string;
  /** Mast reference, or the place's kind (town, village, hamlet, peak, island). */
  detail: string | null;
  lat: number;
  lon: number;
}

export const SearchQuerySchema = z.object({
  q: z.string({ required_error: 'Type something to search for' }).trim().min(1, 'Type something to search for').max(100, 'At most 100 characters'),
  limit: intParam('limit', 1, 50, 10),
});

// --- Tiles ----------------------------------------------------------------------------------------

export const TILE_MAX_ZOOM = 22;

const tileNumber = (label: string) =>
  z
    .string()
    .regex(/^\d{1,8}$/, `${label} must be a whole number`)
    .transform(Number);

/**
 * z/x/y of a Web Mercator XYZ tile: z 0–22, x and y 0 … 2^z − 1 (OGC / Web Mercator tile scheme,
 * common practice of web maps).
 */
export const TileParamsSchema = z
  .object({
    layer: z.enum(['basemap', 'masts', 'signal'], { errorMap: () => ({ message: 'Layer must be basemap, masts or signal' }) }),
    z: tileNumber('z').pipe(z.number().max(TILE_MAX_ZOOM, `z must be 0–${TILE_MAX_ZOOM}`)),
    x: tileNumber('x'),
    y: tileNumber('y'),
  })
  .superRefine((t, ctx) => {
    const n = 2 ** t.z;
    if (t.x >= n) ctx.addIssue({ code: 'custom', path: ['x'], message: `x must be 0–${n - 1} at zoom ${t.z}` });
    if (t.y >= n) ctx.addIssue({ code: 'custom', path: ['y'], message: `y must be 0–${n - 1} at zoom ${t.z}` });
  });
