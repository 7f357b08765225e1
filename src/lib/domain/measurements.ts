/**
 * Measured signal quantities: valid ranges, report-index mapping, RSRP/RSSI/RSRQ relations and the
 * installers' quality grades (3GPP TS 36.133, 38.133, 36.214; grades common practice).
 */

export type MeasurementKind = 'lteRsrp' | 'lteRsrq' | 'lteRssi' | 'lteSinr' | 'nrSsRsrp' | 'nrSsRsrq' | 'nrSsSinr';

export interface MeasurementRange {
  kind: MeasurementKind;
  unit: 'dBm' | 'dB';
  min: number;
  max: number;
  source: string;
}

const RANGES: Record<MeasurementKind, Omit<MeasurementRange, 'kind'>> = {
  lteRsrp: { unit: 'dBm', min: -140, max: -44, source: '3GPP TS 36.133 Table 9.1.4-1' },
  lteRsrq: { unit: 'dB', min: -19.5, max: -3, source: '3GPP TS 36.133 Table 9.1.7-1' },
  // RSSI is not reported in LTE RRC. The window spans the RSRP range plus 10·log10(12·N_RB) for
  // 1.4–20 MHz, widened a little: a plausibility check, not a reporting range.
  lteRssi: { unit: 'dBm', min: -130, max: -10, source: 'derived from the RSRP range and N_RB (TS 36.101 Table 5.6-1)' },
  // SINR/RSSNR is not standardised by 3GPP; this is the Android HAL range.
  lteSinr: { unit: 'dB', min: -20, max: 30, source: 'AOSP HAL LteSignalStrength.rssnr' },
  nrSsRsrp: { unit: 'dBm', min: -156, max: -31, source: '3GPP TS 38.133 Table 10.1.6.1-1' },
  nrSsRsrq: { unit: 'dB', min: -43, max: 20, source: '3GPP TS 38.133 §10.1.11' },
  nrSsSinr: { unit: 'dB', min: -23, max: 40, source: '3GPP TS 38.133 §10.1.16' },
};

// Extended LTE ranges for coverage-enhanced UEs in later releases (RSRP to −156 dBm; RSRQ
// Table 9.1.7-2, −34 … +2.5 dB) — index details from memory, verify.
const EXTENDED_RANGES: Partial<Record<MeasurementKind, Omit<MeasurementRange, 'kind'>>> = {
  lteRsrp: { unit: 'dBm', min: -156, max: -44, source: '3GPP TS 36.133 extended RSRP range' },
  lteRsrq: { unit: 'dB', min: -34, max: 2.5, source: '3GPP TS 36.133 Table 9.1.7-2' },
};

const LABELS: Record<MeasurementKind, string> = {
  lteRsrp: 'LTE RSRP',
  lteRsrq: 'LTE RSRQ',
  lteRssi: 'LTE RSSI',
  lteSinr: 'LTE SINR',
  nrSsRsrp: 'NR SS-RSRP',
  nrSsRsrq: 'NR SS-RSRQ',
  nrSsSinr: 'NR SS-SINR',
};

/** The accepted range of a quantity; `extended` widens LTE RSRP/RSRQ to the coverage-enhancement tables. */
export function getMeasurementRange(kind: MeasurementKind, options: { extended?: boolean } = {}): MeasurementRange {
  const range = (options.extended ? EXTENDED_RANGES[kind] : undefined) ?? RANGES[kind];
  return { kind, ...range };
}

export type ValidationResult = { ok: true } | { ok: false; message: string };

export function validateMeasurement(kind: MeasurementKind, value: number, options: { extended?: boolean } = {}): ValidationResult {
  const { min, max, unit } = getMeasurementRange(kind, options);
  if (!Number.isFinite(value)) return { ok: false, message: `${LABELS[kind]} must be a number` };
  if (value < min || value > max) {
    return { ok: false, message: `${LABELS[kind]} ${value} ${unit} is outside ${min} … ${max} ${unit}` };
  }
  return { ok: true };
}

// ---------------------------------------------------------------------------------------------------------
// Report mapping. Index 0 means "below min"; index k (1 … K) the interval [min + (k−1)·step, min + k·step);
// index K + 1 means "at or above max". LTE: TS 36.133 Tables 9.1.4-1 / 9.1.7-1 (RSRP_00 … RSRP_97,
// RSRQ_00 … RSRQ_34). NR: TS 38.133 §10.1.6/10.1.11/10.1.16, end rows from memory, verify.

type ReportedKind = 'lteRsrp' | 'lteRsrq' | 'nrSsRsrp' | 'nrSsRsrq' | 'nrSsSinr';

const REPORT_STEPS: Record<ReportedKind, number> = { lteRsrp: 1, lteRsrq: 0.5, nrSsRsrp: 1, nrSsRsrq: 0.5, nrSsSinr: 0.5 };

export interface ReportInterval {
  /** Inclusive lower bound, or null for the "below range" index 0. */
  lower: number | null;
  /** Exclusive upper bound, or null for the top "at or above" index. */
  upper: number | null;
}

function getTopIndex(kind: ReportedKind): number {
  const { min, max } = RANGES[kind];
  return Math.round((max - min) / REPORT_STEPS[kind]) + 1;
}

/** The measured interval a reported index stands for, e.g. RSRP_45 → [−96, −95) dBm. */
export function getReportInterval(kind: ReportedKind, index: number): ReportInterval {
  const top = getTopIndex(kind);
  if (!Number.isInteger(index) || index < 0 || index > top) {
    throw new RangeError(`${LABELS[kind]} report index must be a whole number 0 … ${top}, got ${index}`);
  }
  const { min, max } = RANGES[kind];
  const step = REPORT_STEPS[kind];
  if (index === 0) return { lower: null, upper: min };
  if (index === top) return { lower: max, upper: null };
  return { lower: min + (index - 1) * step, upper: min + index * step };
}

/** The index a measured value is reported as. */
export function getReportIndex(kind: ReportedKind, value: number): number {
  const { min } = RANGES[kind];
  if (value < min) return 0;
  return Math.min(getTopIndex(kind), Math.floor((value - min) / REPORT_STEPS[kind]) + 1);
}

// ---------------------------------------------------------------------------------------------------------
// RSRP, RSSI and RSRQ (TS 36.214 §5.1.1 / §5.1.3).

// TS 36.101 §5.6 Table 5.6-1: channel bandwidth (MHz) → resource blocks.
const LTE_RESOURCE_BLOCKS: ReadonlyMap<number, number> = new Map([
  [1.4, 6],
  [3, 15],
  [5, 25],
  [10, 50],
  [15, 75],
  [20, 100],
]);

// TS 38.104 Table 5.3.2-1: bandwidth (MHz) → resource blocks per subcarrier spacing.
const NR_RESOURCE_BLOCKS: Record<15 | 30, ReadonlyMap<number, number>> = {
  15: new Map([
    [5, 25],
    [10, 52],
    [15, 79],
    [20, 106],
    [40, 216],
    [50, 270],
  ]),
  30: new Map([
    [10, 24],
    [20, 51],
    [40, 106],
    [50, 133],
    [60, 162],
    [80, 217],
    [100, 273],
  ]),
};

export const LTE_BANDWIDTHS_MHZ = [...LTE_RESOURCE_BLOCKS.keys()];

export function getLteResourceBlockCount(bandwidthMhz: number): number {
  const count = LTE_RESOURCE_BLOCKS.get(bandwidthMhz);
  if (count === undefined) {
    throw new RangeError(`LTE channel bandwidth must be one of ${LTE_BANDWIDTHS_MHZ.join(', ')} MHz, got ${bandwidthMhz}`);
  }
  return count;
}

export function getNrResourceBlockCount(bandwidthMhz: number, subcarrierSpacingKhz: 15 | 30): number {
  const count = NR_RESOURCE_BLOCKS[subcarrierSpacingKhz]?.get(bandwidthMhz);
  if (count === undefined) {
    throw new RangeError(`No NR resource-block count for ${bandwidthMhz} MHz at ${subcarrierSpacingKhz} kHz`);
  }
  return count;
}

/**
 * RSRP estimated from RSSI: RSRP ≈ RSSI − 10·log10(12·N_RB). Rule of thumb, no normative formula: it
 * assumes every resource element is loaded with equal power and noise is negligible (follows from the TS 36.214 definitions). In a
 * lightly loaded cell RSSI is lower, so this under-estimates RSRP.
 */
export function estimateRsrpFromRssi(rssiDbm: number, bandwidthMhz: number): number {
  return rssiDbm - 10 * Math.log10(12 * getLteResourceBlockCount(bandwidthMhz));
}

/** The inverse rule of thumb, RSSI ≈ RSRP + 10·log10(12·N_RB), same full-load assumption. */
export function estimateRssiFromRsrp(rsrpDbm: number, bandwidthMhz: number): number {
  return rsrpDbm + 10 * Math.log10(12 * getLteResourceBlockCount(bandwidthMhz));
}

/** RSRQ = N·RSRP/RSSI in dB form, exact by definition (TS 36.214 §5.1.3); N = resource blocks measured. */
export function getRsrqDb(rsrpDbm: number, rssiDbm: number, resourceBlocks: number): number {
  return 10 * Math.log10(resourceBlocks) + rsrpDbm - rssiDbm;
}

/**
 * Thermal noise kT·B at 290 K, −174 dBm/Hz rounded, plus the receiver noise figure. One 15 kHz resource
 * element: −132.24 dBm.
 */
export function getThermalNoiseDbm(bandwidthHz: number, noiseFigureDb = 0): number {
  return -174 + 10 * Math.log10(bandwidthHz) + noiseFigureDb;
}

/**
 * Modem `AT+CSQ` RSSI: 0 → ≤ −113 dBm, 31 → ≥ −51 dBm, 2 dB steps; 99 = unknown (3GPP TS 27.007 §8.5 —
 * from memory, verify). Returns null for 99.
 */
export function getRssiFromCsq(csq: number): number | null {
  if (csq === 99) return null;
  if (!Number.isInteger(csq) || csq < 0 || csq > 31) throw new RangeError(`CSQ must be 0 … 31 or 99, got ${csq}`);
  return -113 + 2 * csq;
}

// ---------------------------------------------------------------------------------------------------------
// Quality grades — common practice among installers, no normative source. Boundaries are
// inclusive on the better side (−100 dBm RSRP is fair). NR uses the LTE thresholds; NR's wider ranges make
// this rough at the extremes.

export type SignalGrade = 'excellent' | 'good' | 'fair' | 'poor' | 'unusable';

export type GradedQuantity = 'rsrp' | 'rsrq' | 'sinr';

const GRADE_FLOORS: Record<GradedQuantity, Array<[number, SignalGrade]>> = {
  rsrp: [
    [-80, 'excellent'],
    [-90, 'good'],
    [-100, 'fair'],
    [-110, 'poor'],
  ],
  rsrq: [
    [-10, 'excellent'],
    [-15, 'good'],
    [-20, 'fair'],
  ],
  sinr: [
    [20, 'excellent'],
    [13, 'good'],
    [0, 'fair'],
  ],
};

const LOWEST_GRADE: Record<GradedQuantity, SignalGrade> = { rsrp: 'unusable', rsrq: 'poor', sinr: 'poor' };

const GRADED_QUANTITY: Partial<Record<MeasurementKind, GradedQuantity>> = {
  lteRsrp: 'rsrp',
  nrSsRsrp: 'rsrp',
  lteRsrq: 'rsrq',
  nrSsRsrq: 'rsrq',
  lteSinr: 'sinr',
  nrSsSinr: 'sinr',
};

export const SIGNAL_GRADES: readonly SignalGrade[] = ['excellent', 'good', 'fair', 'poor', 'unusable'];

export function gradeSignal(kind: MeasurementKind, value: number): SignalGrade {
  const quantity = GRADED_QUANTITY[kind];
  if (!quantity) throw new RangeError(`${LABELS[kind]} has no quality grades`);
  const floor = GRADE_FLOORS[quantity].find(([threshold]) => value >= threshold);
  return floor ? floor[1] : LOWEST_GRADE[quantity];
}

export interface GradeBand {
  grade: SignalGrade;
  /** Lowest value of the grade (inclusive); null for the lowest grade. */
  min: number | null;
  /** Lowest value of the next better grade (exclusive); null for the best grade. */
  max: number | null;
}

/** The grades of RSRP, RSRQ or SINR from best to worst, with the value range each covers. */
export function getGradeBands(quantity: GradedQuantity): GradeBand[] {
  const floors = GRADE_FLOORS[quantity];
  const bands: GradeBand[] = floors.map(([min, grade], i) => ({ grade, min, max: i === 0 ? null : floors[i - 1]![0] }));
  bands.push({ grade: LOWEST_GRADE[quantity], min: null, max: floors[floors.length - 1]![0] });
  return bands;
}

/** The worst of several grades, e.g. to summarise a reading from its RSRP, RSRQ and SINR. */
export function getWorstGrade(grades: SignalGrade[]): SignalGrade | null {
  if (grades.length === 0) return null;
  return grades.reduce((worst, grade) => (SIGNAL_GRADES.indexOf(grade) > SIGNAL_GRADES.indexOf(worst) ? grade : worst));
}

/**
 * Physical cell identities: LTE 0…503 = 3·N_ID(1) + N_ID(2) (3GPP TS 36.211 §6.11); NR 0…1007
 * (TS 38.211 §7.4.2.1). Other technologies have no PCI.
 */
export function getPciRange(tech: string): { min: number; max: number } | null {
  if (tech === 'lte') return { min: 0, max: 503 };
  if (tech === 'nr') return { min: 0, max: 1007 };
  return null;
}

/** A message for a PCI outside its technology's range, or null when it fits. */
export function getPciProblem(tech: string, pci: number): string | null {
  const range = getPciRange(tech);
  if (!range || (pci >= range.min && pci <= range.max)) return null;
  return `${tech === 'lte' ? 'LTE' : 'NR'} PCI must be ${range.min}–${range.max}`;
}
