// Catalogue of customer antennas and cables: one field declaration each, the input schemas
// derived from it (shared by endpoints and the admin forms) and the JSON the API returns.
import { z } from 'zod';
import type { CableLossPoint, GainPoint } from '../domain/link-budget';
import { enumOf, hasAnyField, numberField as num, requiredText } from './params';
import { defineRecord, field, type Fields, type JsonOf, type RecordDeclaration, type ValueOf } from './record';

import { ANTENNA_KINDS, type AntennaKind } from '../domain/antenna-kinds';

export { ANTENNA_KINDS, ANTENNA_KIND_LABELS, type AntennaKind } from '../domain/antenna-kinds';

// Customer kit for 4G/5G spans roughly 700–3800 MHz; the limits leave room either side.
export const FREQ_MIN_MHZ = 400;
export const FREQ_MAX_MHZ = 6000;

const freq = num('Frequency')
  .min(FREQ_MIN_MHZ, `Frequency must be at least ${FREQ_MIN_MHZ} MHz`)
  .max(FREQ_MAX_MHZ, `Frequency must be at most ${FREQ_MAX_MHZ} MHz`);

const name = requiredText(80);

const notes = z
  .string()
  .trim()
  .max(2000, 'At most 2000 characters')
  .nullish()
  .transform((s) => (s ? s : null));

/** Rows must be listed from the lowest frequency up, without repeats. */
function increasingFrequencies<T extends { freq_mhz: number }>(rows: T[], ctx: z.RefinementCtx) {
  rows.forEach((row, i) => {
    if (i > 0 && row.freq_mhz <= rows[i - 1]!.freq_mhz) {
      ctx.addIssue({ code: 'custom', path: [i, 'freq_mhz'], message: 'List frequencies from low to high, each once' });
    }
  });
}

export const GainRowSchema = z.object({
  freq_mhz: freq,
  gain_dbi: num('Gain').min(-10, 'Gain must be at least −10 dBi').max(30, 'Gain must be at most 30 dBi'),
});

/** A table of 1–40 rows by frequency, lowest first. */
const frequencyTable = <T extends { freq_mhz: number }>(row: z.ZodType<T>) =>
  z
    .array(row, { required_error: 'Add at least one row', invalid_type_error: 'Add at least one row' })
    .min(1, 'Add at least one row')
    .max(40, 'At most 40 rows')
    .superRefine(increasingFrequencies);

export const GainTableSchema = frequencyTable(GainRowSchema);

export const LossRowSchema = z.object({
  freq_mhz: freq,
  loss_db_per_m: num('Loss').gt(0, 'Loss must be above 0 dB/m').max(5, 'Loss must be at most 5 dB/m'),
});

export const LossTableSchema = frequencyTable(LossRowSchema);

const kind = enumOf(ANTENNA_KINDS);
const ports = num('Ports').int('Ports must be a whole number').min(1, 'At least 1 port').max(8, 'At most 8 ports');
const beamwidth = num('Beamwidth').gt(0, 'Beamwidth must be above 0°').max(360, 'Beamwidth must be at most 360°');

/** Omni and stub antennas radiate all round; a directional one has a narrower beam. */
export function getBeamwidthProblem(k: AntennaKind, beamwidthDeg: number): string | null {
  if (k === 'directional' && beamwidthDeg >= 360) return 'A directional antenna has a beam narrower than 360°';
  if (k !== 'directional' && beamwidthDeg !== 360) return `An ${k === 'omni' ? 'omni' : 'stub'} antenna covers 360°`;
  return null;
}

/** A frequency table: rows as in the API and the column ([{freq_mhz, …}]), held as points, stored as JSON text. */
function tableField<R, P>(schema: z.ZodType<R[], z.ZodTypeDef, unknown>, toPoints: (rows: R[]) => P[], toRows: (points: P[]) => R[]) {
  return field.input(schema.transform(toPoints), { fromRow: (v) => toPoints(v as R[]), toJson: toRows, toRow: (t) => JSON.stringify(toRows(t)) });
}
type GainRow = { freq_mhz: number; gain_dbi: number };
type LossRow = { freq_mhz: number; loss_db_per_m: number };
const gainTable = tableField<GainRow, GainPoint>(
  GainTableSchema,
  (rows) => rows.map((r) => ({ freqMhz: r.freq_mhz, gainDbi: r.gain_dbi })),
  (points) => points.map((p) => ({ freq_mhz: p.freqMhz, gain_dbi: p.gainDbi })),
);
const lossTable = tableField<LossRow, CableLossPoint>(
  LossTableSchema,
  (rows) => rows.map((r) => ({ freqMhz: r.freq_mhz, dbPerM: r.loss_db_per_m })),
  (points) => points.map((p) => ({ freq_mhz: p.freqMhz, loss_db_per_m: p.dbPerM })),
);

/** A change of a catalogue item: any of its fields, at least one, as the value repos take. */
function changeSchema<F extends Fields>(record: RecordDeclaration<F>) {
  return z
    .object(record.changeShape)
    .refine(hasAnyField, { message: 'Nothing to change' })
    .transform((v) => record.toChange(v as Record<string, unknown>));
}

/** The fields every catalogue item ends with. */
const notesAndTimes = { notes: field.input(notes), created_at: field.time(), updated_at: field.time() };

/** A customer antenna, field by field: body and JSON name (= column), how it is written and read. */
export const ANTENNA = defineRecord({
  id: field.id(),
  name: field.input(name),
  kind: field.input(kind),
  ports: field.input(ports.default(1)),
  // Left out on create: 360° (omni and stub); a directional antenna must give it.
  horizontal_beamwidth_deg: field.input(beamwidth.optional(), { fromRow: (v) => v as number }),
  gain_table: gainTable,
  ...notesAndTimes,
});

export type Antenna = ValueOf<typeof ANTENNA.fields>;
export type AntennaJson = JsonOf<typeof ANTENNA.fields>;
/** The audit trail keeps an antenna as the API shows it. */
export const antennaJson = (a: Antenna): AntennaJson => ANTENNA.toJson(a);

export const AntennaInputSchema = z
  .object(ANTENNA.inputShape)
  .superRefine((v, ctx) => {
    if (v.horizontal_beamwidth_deg === undefined) {
      if (v.kind === 'directional') ctx.addIssue({ code: 'custom', path: ['horizontal_beamwidth_deg'], message: 'Required for a directional antenna' });
      return;
    }
    const problem = getBeamwidthProblem(v.kind, v.horizontal_beamwidth_deg);
    if (problem) ctx.addIssue({ code: 'custom', path: ['horizontal_beamwidth_deg'], message: problem });
  })
  .transform((v) => ({ ...ANTENNA.toInput(v), horizontalBeamwidthDeg: v.horizontal_beamwidth_deg ?? 360 }));
export type AntennaInput = z.output<typeof AntennaInputSchema>;

export const AntennaChangeSchema = changeSchema(ANTENNA);
export type AntennaChange = Partial<z.output<typeof AntennaChangeSchema>>;

const connectorLoss = num('Connector loss').min(0, 'Cannot be negative').max(3, 'At most 3 dB per connector');
const connectors = num('Connectors').int('Connectors must be a whole number').min(0, 'Cannot be negative').max(10, 'At most 10 connectors');

/** A feeder cable, field by field: body and JSON name (= column), how it is written and read. */
export const CABLE = defineRecord({
  id: field.id(),
  name: field.input(name),
  loss_table: lossTable,
  // 0.1–0.2 dB per mated pair below 3 GHz — common practice, no source.
  connector_loss_db: field.input(connectorLoss.default(0.15)),
  connectors: field.input(connectors.default(2)),
  ...notesAndTimes,
});

export type Cable = ValueOf<typeof CABLE.fields>;
export type CableJson = JsonOf<typeof CABLE.fields>;
/** The audit trail keeps a cable as the API shows it. */
export const cableJson = (c: Cable): CableJson => CABLE.toJson(c);

export const CableInputSchema = z.object(CABLE.inputShape).transform((v) => CABLE.toInput(v));
export type CableInput = z.output<typeof CableInputSchema>;

export const CableChangeSchema = changeSchema(CABLE);
export type CableChange = Partial<z.output<typeof CableChangeSchema>>;
