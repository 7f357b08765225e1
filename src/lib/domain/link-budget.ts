/**
 * Link budget: free-space loss, EIRP, gain units, antenna gain and cable loss over frequency, sector
 * pattern, and the shortlist's RSRP prediction (ITU-R P.525, 3GPP TR 36.942 §4.2.1, cable datasheets, Bearline's own model).
 */

export const SPEED_OF_LIGHT_M_PER_S = 299_792_458;

/**
 * 20·log10(4π·10⁹/c) = 32.4478 dB for f in MHz and d in km. ITU-R P.525 prints it rounded to 32.4,
 * textbooks use 32.44 or 32.45; the spread is ≤ 0.05 dB.
 */
export const FSPL_CONSTANT_DB = 20 * Math.log10((4 * Math.PI * 1e9) / SPEED_OF_LIGHT_M_PER_S);

/** Gain of a half-wave dipole over isotropic, 1.64 = 2.15 dBi. */
export const DIPOLE_GAIN_DBI = 2.15;

/** Free-space basic transmission loss, ITU-R P.525 point-to-point: 32.4478 + 20·log10 f(MHz) + 20·log10 d(km). */
export function getFreeSpacePathLossDb(freqMhz: number, distanceKm: number): number {
  if (!(freqMhz > 0) || !(distanceKm > 0)) throw new RangeError('Frequency and distance must be positive');
  return FSPL_CONSTANT_DB + 20 * Math.log10(freqMhz) + 20 * Math.log10(distanceKm);
}

/** Distance (km) at which free-space loss reaches `lossDb` — the inverse of `getFreeSpacePathLossDb`. */
export function getFreeSpaceDistanceKm(lossDb: number, freqMhz: number): number {
  return 10 ** ((lossDb - FSPL_CONSTANT_DB - 20 * Math.log10(freqMhz)) / 20);
}

/** EIRP = P_tx + G − L_feeder (dBm, dBi, dB). */
export function getEirpDbm(txPowerDbm: number, antennaGainDbi: number, feederLossDb = 0): number {
  return txPowerDbm + antennaGainDbi - feederLossDb;
}

/** ERP is referred to a half-wave dipole: ERP = EIRP − 2.15 dB. */
export function getErpDbm(eirpDbm: number): number {
  return eirpDbm - DIPOLE_GAIN_DBI;
}

export function getDbiFromDbd(gainDbd: number): number {
  return gainDbd + DIPOLE_GAIN_DBI;
}

export function getDbdFromDbi(gainDbi: number): number {
  return gainDbi - DIPOLE_GAIN_DBI;
}

export function getWattsFromDbm(dbm: number): number {
  return 10 ** ((dbm - 30) / 10);
}

export function getDbmFromWatts(watts: number): number {
  return 10 * Math.log10(watts) + 30;
}

/**
 * Reference-signal energy per resource element when the total power is spread evenly over all
 * 12·N_RB subcarriers, e.g. 46 dBm over 20 MHz → 15.21 dBm (N_RB from 3GPP TS 36.101 Table 5.6-1). Operators may boost RS power.
 */
export function getRsEpreDbm(totalPowerDbm: number, resourceBlocks: number): number {
  return totalPowerDbm - 10 * Math.log10(12 * resourceBlocks);
}

// ---------------------------------------------------------------------------------------------------------
// Catalogue tables over frequency.

export interface GainPoint {
  freqMhz: number;
  gainDbi: number;
}

export interface CableLossPoint {
  freqMhz: number;
  dbPerM: number;
}

function sortByFrequency<T extends { freqMhz: number }>(table: readonly T[], what: string): T[] {
  if (table.length === 0) throw new RangeError(`The ${what} table is empty`);
  if (table.some((p) => !(p.freqMhz > 0))) throw new RangeError(`The ${what} table has a non-positive frequency`);
  return [...table].sort((a, b) => a.freqMhz - b.freqMhz);
}

function interpolateBetween(x: number, x0: number, y0: number, x1: number, y1: number): number {
  return x1 === x0 ? y0 : y0 + ((y1 - y0) * (x - x0)) / (x1 - x0);
}

/**
 * Antenna gain at a frequency, linear in frequency between catalogue points. Outside the table the nearest
 * end value is used and `isOutsideTable` is set: an antenna's gain collapses outside its design band, so
 * callers should warn rather than trust the clamped value.
 */
export function interpolateGain(table: readonly GainPoint[], freqMhz: number): { gainDbi: number; isOutsideTable: boolean } {
  const points = sortByFrequency(table, 'gain');
  const first = points[0]!;
  const last = points[points.length - 1]!;
  if (freqMhz < first.freqMhz) return { gainDbi: first.gainDbi, isOutsideTable: true };
  if (freqMhz > last.freqMhz) return { gainDbi: last.gainDbi, isOutsideTable: true };
  const upperIndex = points.findIndex((p) => p.freqMhz >= freqMhz);
  const upper = points[upperIndex]!;
  const lower = points[Math.max(0, upperIndex - 1)]!;
  return { gainDbi: interpolateBetween(freqMhz, lower.freqMhz, lower.gainDbi, upper.freqMhz, upper.gainDbi), isOutsideTable: false };
}

/**
 * Cable attenuation (dB/m) at a frequency: linear in frequency inside the table; outside it the nearest
 * point is scaled by √f and flagged `approximate`. √f scaling keeps only the conductor loss and under-predicts
 * at UHF/SHF (900 → 2600 MHz: ×1.70 vs ×1.77 … ×2.13 real; two-term fits, from memory, verify).
 */
export function getCableLossPerM(table: readonly CableLossPoint[], freqMhz: number): { dbPerM: number; approximate: boolean } {
  const points = sortByFrequency(table, 'cable loss');
  const first = points[0]!;
  const last = points[points.length - 1]!;
  if (freqMhz < first.freqMhz) return { dbPerM: first.dbPerM * Math.sqrt(freqMhz / first.freqMhz), approximate: true };
  if (freqMhz > last.freqMhz) return { dbPerM: last.dbPerM * Math.sqrt(freqMhz / last.freqMhz), approximate: true };
  const upperIndex = points.findIndex((p) => p.freqMhz >= freqMhz);
  const upper = points[upperIndex]!;
  const lower = points[Math.max(0, upperIndex - 1)]!;
  return { dbPerM: interpolateBetween(freqMhz, lower.freqMhz, lower.dbPerM, upper.freqMhz, upper.dbPerM), approximate: false };
}

export function getCableLossDb(table: readonly CableLossPoint[], freqMhz: number, lengthM: number): { lossDb: number; dbPerM: number; approximate: boolean } {
  const { dbPerM, approximate } = getCableLossPerM(table, freqMhz);
  return { lossDb: dbPerM * lengthM, dbPerM, approximate };
}

/**
 * Datasheet two-term attenuation A = k1·√f + k2·f in dB per 100 ft (f in MHz), converted to dB/m:
 * k1 is the conductor (skin-effect) term, k2 the dielectric term (common datasheet form).
 */
export function getTwoTermCableLossDbPerM(coefficients: { k1: number; k2: number }, freqMhz: number): number {
  const dbPer100Ft = coefficients.k1 * Math.sqrt(freqMhz) + coefficients.k2 * freqMhz;
  return dbPer100Ft / 30.48;
}

/**
 * Representative attenuation by cable class, dB/m — two-term fits through a few published anchors and
 * remembered datasheet points, ±20 % (anchors: ARRL General Class License Manual Table 6-1, Codan Radio Repeater
 * Systems Training Guide App. H; the rest from memory, verify). Prefer the actual cable's datasheet.
 */
export const REFERENCE_CABLE_LOSS: Record<'RG-58' | 'RG-8X' | 'RG-213' | 'LL-6' | 'LL-10', CableLossPoint[]> = {
  'RG-58': tabulate([0.56, 0.61, 0.99, 1.1, 1.29, 1.62]),
  'RG-8X': tabulate([0.36, 0.38, 0.58, 0.64, 0.73, 0.88]),
  'RG-213': tabulate([0.24, 0.26, 0.42, 0.47, 0.55, 0.7]),
  'LL-6': tabulate([0.23, 0.25, 0.36, 0.39, 0.43, 0.51]),
  'LL-10': tabulate([0.12, 0.13, 0.19, 0.2, 0.23, 0.27]),
};

function tabulate(dbPerM: number[]): CableLossPoint[] {
  const frequencies = [800, 900, 1800, 2100, 2600, 3500];
  return frequencies.map((freqMhz, i) => ({ freqMhz, dbPerM: dbPerM[i]! }));
}

/** Typical loss of one mated connector pair below 3 GHz, 0.1–0.2 dB — common practice, no source. */
export const DEFAULT_CONNECTOR_LOSS_DB = 0.15;

/** Common-practice customer feeder attenuation when the catalogue has none. */
export const DEFAULT_CUSTOMER_CABLE_DB_PER_M = 0.35;

export function getConnectorLossDb(connectorCount: number, lossPerConnectorDb = DEFAULT_CONNECTOR_LOSS_DB): number {
  if (!Number.isInteger(connectorCount) || connectorCount < 0) throw new RangeError('Connector count must be a whole number ≥ 0');
  return connectorCount * lossPerConnectorDb;
}

// ---------------------------------------------------------------------------------------------------------
// Sector pattern.

export const DEFAULT_SECTOR_HPBW_DEG = 65;
export const DEFAULT_SECTOR_MAX_ATTENUATION_DB = 20;

/**
 * Horizontal pattern loss (positive dB) `offsetDeg` off a panel's boresight: min(12·(θ/θ3dB)², A_m), the
 * 3GPP sector model of TR 36.942 §4.2.1 (from memory, verify). The same parabola gives a
 * customer antenna's aiming loss with its own beamwidth (10° off a 40° beam ≈ 0.75 dB).
 */
export function getSectorPatternLossDb(offsetDeg: number, hpbwDeg = DEFAULT_SECTOR_HPBW_DEG, maxAttenuationDb = DEFAULT_SECTOR_MAX_ATTENUATION_DB): number {
  return Math.min(12 * (offsetDeg / hpbwDeg) ** 2, maxAttenuationDb);
}

// ---------------------------------------------------------------------------------------------------------
// RSRP prediction (Bearline's own model).

/** RS EPRE: 46 dBm spread over 100 RB ≈ 15.2 dBm per resource element — common practice default. */
export const DEFAULT_RS_EPRE_DBM = 15.2;
/** Macro panel gain, typical 15–18 dBi — common practice default. */
export const DEFAULT_MAST_GAIN_DBI = 17;
/** Mast jumper/feeder loss — common practice default. */
export const DEFAULT_MAST_FEEDER_LOSS_DB = 0.5;

export interface RsrpPredictionInput {
  freqMhz: number;
  distanceM: number;
  rsEpreDbm?: number;
  mastGainDbi?: number;
  mastFeederLossDb?: number;
  /** wrap180(bearing mast→customer − sector azimuth); omit when the azimuth is unknown (no pattern loss). */
  sectorOffsetDeg?: number | null;
  sectorHpbwDeg?: number;
  sectorMaxAttenuationDb?: number;
  /** Terrain diffraction from the path profile (terrain.ts). */
  diffractionLossDb?: number;
  /** Empirical clutter/excess loss beyond free space and terrain. */
  excessLossDb?: number;
  customerGainDbi: number;
  cableLossDb?: number;
  connectorLossDb?: number;
  /** Median measured − modelled residual of this cell's readings. */
  calibrationOffsetDb?: number;
}

export type BudgetTermKey =
  'rsEpre' | 'mastGain' | 'mastFeeder' | 'freeSpace' | 'diffraction' | 'excess' | 'sectorPattern' | 'customerGain' | 'cable' | 'connectors' | 'calibration';

export interface BudgetTerm {
  key: BudgetTermKey;
  label: string;
  /** Signed contribution: gains positive, losses negative; the terms sum to the RSRP. */
  db: number;
}

export interface RsrpPrediction {
  rsrpDbm: number;
  /** RS EIRP per resource element at the mast, dBm. */
  rsEirpDbm: number;
  /** Free space + diffraction + excess, dB (positive). */
  pathLossDb: number;
  terms: BudgetTerm[];
}

/**
 * Predicted RSRP = RS EPRE + mast gain − mast feeder − path loss − sector pattern loss + customer gain
 * − cable − connectors (+ calibration). A free-space-plus-terrain model: real rural paths add clutter
 * loss of typically tens of dB, which belongs in `excessLossDb` or comes back through calibration.
 */
export function predictRsrp(input: RsrpPredictionInput): RsrpPrediction {
  const rsEpreDbm = input.rsEpreDbm ?? DEFAULT_RS_EPRE_DBM;
  const mastGainDbi = input.mastGainDbi ?? DEFAULT_MAST_GAIN_DBI;
  const mastFeederLossDb = input.mastFeederLossDb ?? DEFAULT_MAST_FEEDER_LOSS_DB;
  const freeSpaceDb = getFreeSpacePathLossDb(input.freqMhz, input.distanceM / 1000);
  const diffractionDb = input.diffractionLossDb ?? 0;
  const excessDb = input.excessLossDb ?? 0;
  const sectorDb =
    input.sectorOffsetDeg === undefined || input.sectorOffsetDeg === null
      ? 0
      : getSectorPatternLossDb(input.sectorOffsetDeg, input.sectorHpbwDeg, input.sectorMaxAttenuationDb);

  const loss = (db: number) => (db === 0 ? 0 : -db);
  const terms: BudgetTerm[] = [
    { key: 'rsEpre', label: 'RS EPRE at the mast', db: rsEpreDbm },
    { key: 'mastGain', label: 'Mast antenna gain', db: mastGainDbi },
    { key: 'mastFeeder', label: 'Mast feeder loss', db: loss(mastFeederLossDb) },
    { key: 'freeSpace', label: 'Free-space path loss', db: loss(freeSpaceDb) },
    { key: 'diffraction', label: 'Terrain diffraction loss', db: loss(diffractionDb) },
    { key: 'excess', label: 'Clutter / excess loss', db: loss(excessDb) },
    { key: 'sectorPattern', label: 'Sector pattern loss', db: loss(sectorDb) },
    { key: 'customerGain', label: 'Customer antenna gain', db: input.customerGainDbi },
    { key: 'cable', label: 'Customer cable loss', db: loss(input.cableLossDb ?? 0) },
    { key: 'connectors', label: 'Connector loss', db: loss(input.connectorLossDb ?? 0) },
    { key: 'calibration', label: 'Calibration from readings', db: input.calibrationOffsetDb ?? 0 },
  ];
  return {
    rsrpDbm: terms.reduce((sum, term) => sum + term.db, 0),
    rsEirpDbm: getEirpDbm(rsEpreDbm, mastGainDbi, mastFeederLossDb),
    pathLossDb: freeSpaceDb + diffractionDb + excessDb,
    terms,
  };
}
