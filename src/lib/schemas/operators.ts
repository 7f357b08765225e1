// Operators (MCC/MNC and map colour): input schemas and the JSON the API returns.
import { z } from 'zod';
import { hasAnyField, requiredText } from './params';

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

export const OperatorInputSchema = z.object({ name, mcc, mnc, colour: colour.optional() });
export type OperatorInput = z.output<typeof OperatorInputSchema>;

export const OperatorChangeSchema = z
  .object({ name: name.optional(), mcc: mcc.optional(), mnc: mnc.optional(), colour: colour.optional() })
  .refine(hasAnyField, { message: 'Nothing to change' });
export type OperatorChange = z.output<typeof OperatorChangeSchema>;

export interface OperatorJson {
  id: string;
  name: string;
  mcc: string;
  mnc: string;
  /** MCC-MNC as usually written, e.g. "001-01". */
  plmn: string;
  colour: string;
  cell_count: number;
  created_at: string;
  updated_at: string;
}
