/**
 * Calibration of one cell's prediction by its readings, shrunk toward the model by how many readings
 * there are and how much they disagree (decision record 0004).
 *
 * The correction the readings suggest is the median residual (measured − modelled). Before any reading,
 * the cell's true correction is taken as centred on 0 dB with the model's own spread τ; the readings'
 * median has a standard error of √(π/2)·σ/√n for normally spread residuals (the textbook large-sample
 * result for the median). Weighting the two by their inverse variances (a normal prior and a normal
 * estimate) gives
 *
 *     w = τ² / (τ² + SE²),   shift = w · median,   uncertainty = √(1 / (1/τ² + 1/SE²))
 *
 * so one or two readings move a prediction a little and twenty agreeing readings move it almost fully.
 */

/** Spread of a tuned macro-cell model against measurements: 6–8 dB is common practice; 8 dB is used. */
export const MODEL_SPREAD_DB = 8;
/** Residual spread assumed until there are enough readings to measure one. */
export const MIN_READINGS_FOR_SPREAD = 3;
/** Measured spreads below this are not trusted (readings of one spot agree too well) — common practice. */
export const MIN_RESIDUAL_SPREAD_DB = 3;
/** A shift never exceeds this, however many readings agree. */
export const MAX_CALIBRATION_SHIFT_DB = 20;
/** √(π/2): the median's standard error relative to the mean's for normal samples. */
const MEDIAN_EFFICIENCY = Math.sqrt(Math.PI / 2);

export type CalibrationConfidence = 'high' | 'medium' | 'low';

/** What the readings of one cell say, aggregated: count, median and (sample) standard deviation of residuals. */
export interface ResidualSummary {
  count: number;
  medianDb: number;
  /** Sample standard deviation; null with fewer than two readings. */
  spreadDb: number | null;
}

export interface Calibration {
  /** The shift applied to the prediction. */
  offsetDb: number;
  readingsUsed: number;
  /** The readings' median residual before shrinking. */
  medianResidualDb: number;
  /** Share of the median that is applied (0…1). */
  weight: number;
  /** Standard deviation of the corrected prediction's error (dB). */
  uncertaintyDb: number;
  confidence: CalibrationConfidence;
}

/** Count, median and sample standard deviation of residuals; null without finite values. */
export function summariseResiduals(residualsDb: readonly number[]): ResidualSummary | null {
  const values = residualsDb.filter(Number.isFinite).sort((a, b) => a - b);
  const n = values.length;
  if (n === 0) return null;
  const mid = Math.floor(n / 2);
  const medianDb = n % 2 ? values[mid]! : (values[mid - 1]! + values[mid]!) / 2;
  if (n < 2) return { count: n, medianDb, spreadDb: null };
  const mean = values.reduce((s, v) => s + v, 0) / n;
  const spreadDb = Math.sqrt(values.reduce((s, v) => s + (v - mean) ** 2, 0) / (n - 1));
  return { count: n, medianDb, spreadDb };
}

export function getConfidence(uncertaintyDb: number): CalibrationConfidence {
  if (uncertaintyDb <= 3) return 'high';
  if (uncertaintyDb <= 5) return 'medium';
  return 'low';
}

/** The shrinkage rule: the shift, its weight and the remaining uncertainty from a residual summary. */
export function shrinkCalibration(summary: ResidualSummary | null, modelSpreadDb = MODEL_SPREAD_DB): Calibration | null {
  if (!summary || summary.count <= 0 || !Number.isFinite(summary.medianDb)) return null;
  const sigma = summary.count >= MIN_READINGS_FOR_SPREAD && summary.spreadDb !== null ? Math.max(MIN_RESIDUAL_SPREAD_DB, summary.spreadDb) : modelSpreadDb;
  const standardError = (MEDIAN_EFFICIENCY * sigma) / Math.sqrt(summary.count);
  const tau2 = modelSpreadDb ** 2;
  const weight = tau2 / (tau2 + standardError ** 2);
  const offsetDb = Math.max(-MAX_CALIBRATION_SHIFT_DB, Math.min(MAX_CALIBRATION_SHIFT_DB, weight * summary.medianDb));
  const uncertaintyDb = Math.sqrt(1 / (1 / tau2 + 1 / standardError ** 2));
  return { offsetDb, readingsUsed: summary.count, medianResidualDb: summary.medianDb, weight, uncertaintyDb, confidence: getConfidence(uncertaintyDb) };
}

/** Shrunk calibration straight from a cell's residuals (measured − modelled, dB). */
export function getCalibration(residualsDb: readonly number[]): Calibration | null {
  return shrinkCalibration(summariseResiduals(residualsDb));
}
