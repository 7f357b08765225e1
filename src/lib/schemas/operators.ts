// Operators (MCC/MNC and map colour): input schemas and the JSON the API returns.
import { z } from 'zod';
import { hasAnyField, requiredText } from './params';

/**
 * Default operator colours, in the order new operators take them: the Okabe–Ito palette, chosen to
 * stay distinguishable with the common colour-vision deficiencies (Okabe & Ito, "Color Universal
 * Design", 2008). Admins may pick any colour.
 */
export const OPERATOR_PALETTE = ['#0072b2', '#e69f00', '#009e73', '#cc79a7', '#d55e00', '#56b4e9', '#f0e442', '#000000'] as const;

/** The first palette colour no operator uses yet (the palette repeats when all are taken). */
export function pickDefaultColour(used: readonly string[]): string {
  const taken = new Set(used.map((c) => c.toLowerCase()));
  return OPERATOR_PALETTE.find((c) => !taken.has(c)) ?? OPERATOR_PALETTE[used.length % OPERATOR_PALETTE.length]!;
}

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
