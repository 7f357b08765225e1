// Operators (MCC/MNC and map colour): the one field declaration, the input schemas derived from
// it, and the JSON the API returns.
import { z } from 'zod';
import { hasAnyField, requiredText } from './params';
import { defineRecord, field, type JsonOf, type ValueOf } from './record';

export { OPERATOR_PALETTE, pickDefaultColour } from '../domain/operator-palette';

const name = requiredText(80);
// MCC is three digits, MNC two or three (ITU-T E.212); 001/01 is the test network code.
const mcc = z
  .string({ required_error: 'Required', invalid_type_error: 'Required' })
  .trim()
  .regex(/^\d{3}$/, 'MCC is three digits');
const mnc = z
  .string({ required_error: 'Required', invalid_type_error: 'Required' })
  .trim()
  .regex(/^\d{2,3}$/, 'MNC is two or three digits');
const colour = z
  .string({ invalid_type_error: 'Give a colour like #0072b2' })
  .trim()
  .regex(/^#[0-9a-fA-F]{6}$/, 'Give a colour like #0072b2')
  .transform((c) => c.toLowerCase());

/** An operator, field by field: body and JSON name (= column), how it is written, read and audited. */
export const OPERATOR = defineRecord({
  id: field.id(),
  name: field.input(name),
  mcc: field.input(mcc),
  mnc: field.input(mnc),
  /** MCC-MNC as usually written, e.g. "001-01". */
  plmn: field.value<string>({ sql: "{t}.mcc || '-' || {t}.mnc" }),
  // Left out on create: the repo picks a colour not yet in use.
  colour: field.input(colour.optional(), { fromRow: (v) => v as string }),
  cell_count: field.count({ sql: '(SELECT count(*) FROM cells c WHERE c.operator_id = {t}.id)' }),
  created_at: field.time(),
  updated_at: field.time(),
});

export type Operator = ValueOf<typeof OPERATOR.fields>;
export type OperatorJson = JsonOf<typeof OPERATOR.fields>;

export const operatorJson = (o: Operator): OperatorJson => OPERATOR.toJson(o);

export const OperatorInputSchema = z.object(OPERATOR.inputShape);
export type OperatorInput = z.output<typeof OperatorInputSchema>;

export const OperatorChangeSchema = z.object(OPERATOR.changeShape).refine(hasAnyField, { message: 'Nothing to change' });
export type OperatorChange = z.output<typeof OperatorChangeSchema>;
