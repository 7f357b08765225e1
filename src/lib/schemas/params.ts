// Query-string parameter schemas shared by endpoints (values arrive as strings).
import { z } from 'zod';

export const numberParam = (label: string) =>
  z
    .string({ required_error: `${label} is required` })
    .trim()
    .min(1, `${label} is required`)
    .refine((s) => Number.isFinite(Number(s)), `${label} must be a number`)
    .transform(Number);

export const idParam = z.string().regex(/^\d{1,18}$/, 'Not a valid id');

/** A calendar date inside the magnetic model's validity (WMM2025: 2025–2029). */
export const modelDateParam = z
  .string()
  .regex(/^\d{4}-\d{2}-\d{2}$/, 'Date must be YYYY-MM-DD')
  .refine((s) => !Number.isNaN(Date.parse(`${s}T00:00:00Z`)), 'Not a real date')
  .transform((s) => new Date(`${s}T00:00:00Z`))
  .refine((d) => d.getUTCFullYear() >= 2025 && d.getUTCFullYear() <= 2029, 'The magnetic model covers 2025–2029');
