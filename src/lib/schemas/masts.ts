// Masts and their cells: one field declaration each (lib/schemas/record.ts), and the create and
// change schemas derived from it (shared by endpoints and forms).
import { z } from 'zod';
import { TechSchema, MastStatusSchema, StructureTypeSchema } from './mast-enums';
import { checkRadio } from './radio';
import { defineRecord, field, isoTime, numberOrNull, orNull, type ChangeOf, type InputOf, type JsonOf, type ValueOf } from './record';
import { ID_PATTERN, INT4_MAX, dateTimeField, hasChange, numberField, optionalText, requiredText, RowVersionSchema, textField } from './params';

const num = (label: string) => numberField(label, `${label} must be a number`);

export const LatSchema = num('Latitude').min(-90, 'Latitude must be between −90 and 90').max(90, 'Latitude must be between −90 and 90');
export const LonSchema = num('Longitude').min(-180, 'Longitude must be between −180 and 180').max(180, 'Longitude must be between −180 and 180');

// --- Mast ------------------------------------------------------------------------------------

const groundElevation = num('Ground elevation')
  .min(-500, 'Ground elevation must be at least −500 m')
  .max(9000, 'Ground elevation must be at most 9000 m')
  .nullish()
  .transform((v) => v ?? null);
const structureHeight = num('Structure height')
  .min(0, 'Cannot be negative')
  .max(700, 'Structure height must be at most 700 m')
  .nullish()
  .transform((v) => v ?? null);

/** A mast, field by field: body and JSON name (= column), how it is written, read and audited. */
export const MAST = defineRecord({
  id: field.id(),
  name: field.input(requiredText(120)),
  reference: field.input(optionalText(40)),
  // The position is stored as one point (`geom`): the repo writes it from lat and lon together.
  lat: field.input(LatSchema, { column: false, sql: 'ST_Y({t}.geom)' }),
  lon: field.input(LonSchema, { column: false, sql: 'ST_X({t}.geom)' }),
  ground_elevation_m: field.input(groundElevation),
  structure_height_m: field.input(structureHeight),
  structure_type: field.input(StructureTypeSchema.default('other')),
  status: field.input(MastStatusSchema.default('active')),
  access_notes: field.input(optionalText(2000)),
  source: field.input(optionalText(60).transform((s) => s ?? 'manual')),
  created_by: field.ref(),
  updated_by: field.ref(),
  created_at: field.time(),
  updated_at: field.time(),
  row_version: field.value<number>({ audit: true }),
});

export type Mast = ValueOf<typeof MAST.fields>;
export type MastJson = JsonOf<typeof MAST.fields>;
export type MastInput = InputOf<typeof MAST.fields>;
export type MastChange = ChangeOf<typeof MAST.fields> & { rowVersion: number };

/** A mast as lists, exports and the review's candidates name it: who it is and where. */
export const MAST_PLACE = defineRecord({
  id: MAST.fields.id,
  name: MAST.fields.name,
  reference: MAST.fields.reference,
  status: MAST.fields.status,
  structure_type: MAST.fields.structure_type,
  lat: MAST.fields.lat,
  lon: MAST.fields.lon,
});
export type MastPlace = ValueOf<typeof MAST_PLACE.fields>;
export type MastPlaceJson = JsonOf<typeof MAST_PLACE.fields>;

export const MastInputSchema = z.object(MAST.inputShape).transform((v): MastInput => MAST.toInput(v));

export const MastChangeSchema = z
  .object({ row_version: RowVersionSchema, ...MAST.changeShape })
  .refine(hasChange, { message: 'Nothing to change' })
  .refine((v) => (v.lat === undefined) === (v.lon === undefined), { message: 'Give lat and lon together', path: ['lat'] })
  .transform((v): MastChange => ({ rowVersion: v.row_version, ...MAST.toChange(v) }));

// --- Cell ------------------------------------------------------------------------------

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

/** An operator as a cell or mast names it. */
export interface OperatorRef {
  id: string;
  name: string;
  colour: string;
}

/** A cell: one operator's carrier on one sector of a mast. Selected with its operator joined as `o`. */
export const CELL = defineRecord({
  id: field.id(),
  mast_id: field.id({ audit: true }),
  operator_id: field.input(OperatorIdSchema, { json: false, fromRow: (v) => String(v) }),
  operator: field.value<OperatorRef>({ sql: "json_build_object('id', {t}.operator_id::text, 'name', o.name, 'colour', o.colour)" }),
  tech: field.input(TechSchema),
  // Derived from the channel when not given; the value holds the resolved label.
  band: field.input(textField(20).nullish(), { fromRow: (v) => v as string }),
  channel: field.input(ChannelSchema),
  dl_mhz: field.value<number | null>({ write: true }),
  pci: field.input(PciSchema.transform(orNull)),
  cell_identity: field.input(cellIdentity.transform(orNull), { fromRow: numberOrNull }),
  sector_azimuth_deg: field.input(AzimuthSchema.transform(orNull)),
  antenna_height_m: field.input(antennaHeight.transform(orNull)),
  bandwidth_mhz: field.input(bandwidth.transform(orNull)),
  rs_power_dbm: field.input(rsPower.default(15.2)),
  last_observed_at: field.input(lastObserved.transform(orNull), { audit: false, toJson: isoTime }),
  row_version: field.value<number>(),
  created_at: field.time(),
  updated_at: field.time(),
});

/** A cell's radio fields, in the records that show a cell (a plan's cell, a sighting's cells). */
export const CELL_RADIO = (({ tech, band, channel, dl_mhz, pci, sector_azimuth_deg }) => ({ tech, band, channel, dl_mhz, pci, sector_azimuth_deg }))(
  CELL.fields,
);

export type Cell = ValueOf<typeof CELL.fields>;
export type CellJson = JsonOf<typeof CELL.fields>;
/** A checked cell: the band resolved and its downlink frequency (NaN when the channel is in no band). */
export type CellInput = Omit<InputOf<typeof CELL.fields>, 'band'> & { band: string; dlMhz: number };

export const CellInputSchema = z.object(CELL.inputShape).transform((v, ctx): CellInput => ({ ...CELL.toInput(v), ...checkRadio(v, ctx) }));

/** A partial change; the repo merges it with the stored cell and checks the result with CellInputSchema. */
export const CellChangeSchema = z
  .object({
    ...CELL.changeShape,
    /** The version the change was made from; a stale one is refused with 409. */
    row_version: RowVersionSchema,
  })
  .refine(hasChange, { message: 'Nothing to change' });
/** The API always sends row_version; code inside the server (review merges) may leave it out. */
export type CellChange = Omit<z.output<typeof CellChangeSchema>, 'row_version'> & { row_version?: number };
