/**
 * Downlink quality beyond RSRP: noise, SINR against the same operator's co-channel cells, and the
 * expected throughput from SINR.
 *
 * Sources:
 * - Boltzmann constant k = 1.380649·10⁻²³ J/K, exact since the 2019 SI redefinition (BIPM, SI Brochure,
 *   9th edition, 2019, §2.2); reference temperature T₀ = 290 K (ITU-R P.372 and IEEE Std 145 use 290 K
 *   for noise figure). kT₀ = −173.98 dBm/Hz.
 * - RSRP is a power per 15 kHz resource element (3GPP TS 36.211 §6.2.3, Δf = 15 kHz; TS 36.214 §5.1.1),
 *   so SINR against RSRP-based powers uses the noise in one resource element.
 * - Throughput: the attenuated and truncated Shannon bound of 3GPP TR 36.942 Annex A (A.2): downlink
 *   α = 0.6, SINR_MIN = −10 dB, Thr_MAX = 4.4 bit/s/Hz (from memory, verify against the table).
 *   The table is for one stream and already includes implementation losses.
 */

export const BOLTZMANN_J_PER_K = 1.380649e-23;
export const NOISE_REFERENCE_TEMPERATURE_K = 290;
/** One LTE subcarrier / resource element (3GPP TS 36.211 §6.2.3). */
export const RESOURCE_ELEMENT_HZ = 15_000;
/**
 * Receiver noise figure of an LTE router or handset: 7 dB is common practice (7–9 dB; TR 36.942 assumes
 * 9 dB for the UE — from memory, verify).
 */
export const DEFAULT_NOISE_FIGURE_DB = 7;
/**
 * Share of the time a neighbouring cell transmits on the resource elements the customer uses. 0.5–1.0 is
 * common practice; half load is a typical busy hour in rural cells — common practice, no source.
 */
export const DEFAULT_NEIGHBOUR_LOAD = 0.5;

/** 3GPP TR 36.942 Annex A, downlink (from memory, verify). */
export const DOWNLINK_SHANNON = { alpha: 0.6, sinrMinDb: -10, maxBitsPerHz: 4.4 } as const;

/** Share of the carrier spent on control channels, reference signals and guard bands — common practice (~25 %). */
export const DEFAULT_OVERHEAD = 0.25;
/** Carrier bandwidth when a cell does not record one — common practice for rural LTE. */
export const DEFAULT_BANDWIDTH_MHZ = 10;
/**
 * A 2×2 MIMO kit adds nothing below 5 dB SINR and doubles the rate above 20 dB, linearly between — common
 * practice, no source (rank 2 needs a good SINR).
 */
export const MIMO_GAIN_FROM_DB = 5;
export const MIMO_GAIN_FULL_DB = 20;

/** Thermal noise kT₀B plus the receiver noise figure (dBm). 15 kHz, NF 0 → −132.22 dBm. */
export function getNoisePowerDbm(bandwidthHz: number, noiseFigureDb = DEFAULT_NOISE_FIGURE_DB): number {
  if (!(bandwidthHz > 0)) throw new RangeError('Bandwidth must be positive');
  const kT0DbmPerHz = 10 * Math.log10(BOLTZMANN_J_PER_K * NOISE_REFERENCE_TEMPERATURE_K) + 30;
  return kT0DbmPerHz + 10 * Math.log10(bandwidthHz) + noiseFigureDb;
}

const toMw = (dbm: number) => 10 ** (dbm / 10);

export interface SinrOptions {
  noiseFigureDb?: number;
  neighbourLoad?: number;
}

/**
 * SINR = P_s / (L·Σ P_i + N_RE), every power per resource element (RSRP). Serving −80 dBm, one neighbour
 * −90 dBm at load 1, NF 7 dB → 10.00 dB.
 */
export function getSinrDb(servingDbm: number, interferersDbm: readonly number[], options: SinrOptions = {}): number {
  const load = options.neighbourLoad ?? DEFAULT_NEIGHBOUR_LOAD;
  if (!(load >= 0 && load <= 1)) throw new RangeError('Neighbour load must be between 0 and 1');
  const noiseMw = toMw(getNoisePowerDbm(RESOURCE_ELEMENT_HZ, options.noiseFigureDb ?? DEFAULT_NOISE_FIGURE_DB));
  const interferenceMw = interferersDbm.reduce((sum, p) => sum + toMw(p), 0) * load;
  return 10 * Math.log10(toMw(servingDbm) / (interferenceMw + noiseMw));
}

/** Spectral efficiency (bit/s/Hz) from SINR by TR 36.942 Annex A: 0 below SINR_MIN, α·log2(1 + SINR), capped. */
export function getSpectralEfficiency(sinrDb: number, shannon: { alpha: number; sinrMinDb: number; maxBitsPerHz: number } = DOWNLINK_SHANNON): number {
  if (sinrDb < shannon.sinrMinDb) return 0;
  return Math.min(shannon.maxBitsPerHz, shannon.alpha * Math.log2(1 + 10 ** (sinrDb / 10)));
}

/** SINR (dB) at which the attenuated Shannon bound reaches its cap: 2^(4.4/0.6) − 1 → 22.05 dB downlink. */
export function getSinrAtMaxEfficiencyDb(shannon = DOWNLINK_SHANNON): number {
  return 10 * Math.log10(2 ** (shannon.maxBitsPerHz / shannon.alpha) - 1);
}

/** Rate multiplier of a MIMO kit at a SINR: 1 for one port; up to 2 for two or more (see MIMO_GAIN_*). */
export function getMimoFactor(sinrDb: number, ports: number): number {
  if (ports < 2) return 1;
  const share = Math.min(1, Math.max(0, (sinrDb - MIMO_GAIN_FROM_DB) / (MIMO_GAIN_FULL_DB - MIMO_GAIN_FROM_DB)));
  return 1 + share;
}

export interface ThroughputOptions {
  ports?: number;
  overhead?: number;
}

/**
 * Expected downlink rate (Mbit/s) with the whole carrier to one user: SE × bandwidth × (1 − overhead) × MIMO
 * factor. Users share a cell, so this is an "up to" figure.
 */
export function getExpectedThroughputMbps(sinrDb: number, bandwidthMhz: number, options: ThroughputOptions = {}): number {
  if (!(bandwidthMhz > 0)) throw new RangeError('Bandwidth must be positive');
  const overhead = options.overhead ?? DEFAULT_OVERHEAD;
  return getSpectralEfficiency(sinrDb) * bandwidthMhz * (1 - overhead) * getMimoFactor(sinrDb, options.ports ?? 1);
}
