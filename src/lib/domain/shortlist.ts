/**
 * Ranking candidate cells for one customer address (the shortlist).
 *
 * Model (Bearline's own, documented defaults):
 *   predicted RSRP = RS EPRE + mast gain − mast feeder − free space − terrain diffraction − clutter/excess
 *                    − sector pattern loss + customer antenna gain − cable − connectors + calibration
 * (Bearline's own model). Terrain diffraction comes from the elevation profile where one covers the path (single knife edge on
 * the worst obstacle, ITU-R P.526). The clutter/excess term is one flat value for rural paths, and each
 * cell's readings shift its prediction by their median residual, shrunk toward the model by how many
 * readings there are and how much they agree (calibration.ts). SINR counts the same operator's other
 * cells on the same channel as interference, and the rank score weighs RSRP and SINR (`getRankScore`).
 */
import { getDistanceM, getInitialBearing, getReverseBearing, wrap180, type LatLon } from './geodesy';
import { getDeclination, getMagneticBearing } from './declination';
import { getCableLossDb, getConnectorLossDb, interpolateGain, predictRsrp, type CableLossPoint, type GainPoint, type RsrpPrediction } from './link-budget';
import { analysePathProfile, getElevationAngleDeg, STANDARD_K_FACTOR, type PathClassification, type ProfileSample } from './terrain';
import { gradeSignal, type SignalGrade } from './measurements';
import { type Calibration } from './calibration';
import { formatDb, formatDbi, formatDegrees, formatDistance, formatMetres, formatNumber } from './format';
import { DEFAULT_BANDWIDTH_MHZ, DOWNLINK_SHANNON, getExpectedThroughputMbps, getSinrAtMaxEfficiencyDb, getSinrDb, type SinrOptions } from './link-quality';

export { MAX_CALIBRATION_SHIFT_DB, getCalibration, type Calibration } from './calibration';

/** Flat clutter/excess loss for rural paths beyond free space and terrain — common practice, no source. */
export const DEFAULT_EXCESS_LOSS_DB = 15;
/** A preferred operator's cells rank as if this much stronger — common practice, no source. */
export const DEFAULT_OPERATOR_PREFERENCE_DB = 6;
/**
 * Rank score = min(RSRP, RSRP_SCORE_CAP) + SINR_SCORE_WEIGHT × SINR clamped to the throughput table's
 * working range (TR 36.942 Annex A: −10 dB … 22.05 dB) + operator preference. Above about −80 dBm
 * ("excellent" among installers — common practice) more signal buys no speed while interference still
 * costs it, so a clean sector farther away beats a sector edge next to the mast. One dB of SINR counts
 * as one dB of RSRP — common practice, no source.
 */
export const RSRP_SCORE_CAP_DBM = -80;
export const SINR_SCORE_WEIGHT = 1;
/** A co-channel cell of the same operator within this many dB of the serving one marks a sector edge — common practice. */
export const SECTOR_EDGE_MARGIN_DB = 6;
export const DEFAULT_SEARCH_RADIUS_M = 35_000;
/** Mast antenna height when a cell does not record one — common practice, no source. */
export const DEFAULT_MAST_ANTENNA_HEIGHT_M = 25;
/** Closer than this the customer is at the mast itself. */
export const AT_MAST_M = 30;

export interface CandidateCell {
  cellId: string;
  mastId: string;
  mastName: string;
  mastPosition: LatLon;
  mastGroundM: number | null;
  operatorId: string;
  operatorName: string;
  tech: string;
  band: string;
  channel: number;
  dlMhz: number;
  pci: number | null;
  sectorAzimuthDeg: number | null;
  antennaHeightM: number | null;
  rsPowerDbm: number | null;
  /** Carrier bandwidth; DEFAULT_BANDWIDTH_MHZ when unknown. */
  bandwidthMhz?: number | null;
}

export interface AntennaSpec {
  id: string;
  name: string;
  gainTable: GainPoint[];
  horizontalBeamwidthDeg: number | null;
  /** Antenna ports: two or more make a MIMO kit. */
  ports?: number;
}

export interface CableSpec {
  id: string;
  name: string;
  lossTable: CableLossPoint[];
  connectorLossDb: number;
  connectors: number;
}

export interface Kit {
  antenna: AntennaSpec;
  cable: CableSpec | null;
  cableM: number;
  mountHeightM: number;
}

export interface CandidateContext {
  /** Ground heights from the customer (0 m) to the mast; null where no elevation data covers the path. */
  profile: ProfileSample[] | null;
  calibration: Calibration | null;
}

export interface ShortlistSettings {
  customer: LatLon;
  customerGroundM: number | null;
  date: Date;
  /**
   * The magnetic declination at the customer on `date`, when the caller has it: the same for every
   * candidate of one shortlist, so it is worked out once (`getDeclination`) rather than per cell.
   */
  declinationDeg?: number;
  kit: Kit;
  /** The customer's current antenna (e.g. the router's own) for the expected improvement. */
  currentKit: Kit | null;
  preferredOperatorId?: string | null;
  excessLossDb?: number;
  sinr?: SinrOptions;
  operatorPreferenceDb?: number;
  k?: number;
}

export interface ShortlistEntry {
  cell: CandidateCell;
  distanceM: number;
  bearingTrueDeg: number;
  bearingMagneticDeg: number;
  declinationDeg: number;
  bearingFromMastDeg: number;
  sectorOffsetDeg: number | null;
  elevationDeg: number;
  terrain: {
    status: PathClassification | 'unknown';
    worstClearanceM: number | null;
    worstDistanceM: number | null;
    diffractionLossDb: number;
  };
  prediction: RsrpPrediction;
  predictedRsrpDbm: number;
  expectedGainDb: number | null;
  grade: SignalGrade;
  calibration: Calibration | null;
  /** True when the cell belongs to the preferred operator. */
  preferred: boolean;
  /** Downlink SINR against the same operator's co-channel cells among the candidates (null until assessed). */
  sinrDb: number | null;
  sinrGrade: SignalGrade | null;
  /** Co-channel cells counted as interference. */
  interferers: number;
  /** Expected downlink rate with the whole carrier (Mbit/s, an "up to" figure). */
  expectedThroughputMbps: number | null;
  bandwidthMhz: number;
  /** Rank score, see `getRankScore`. */
  score: number;
  warnings: string[];
}

/** The rank score of RSRP_SCORE_CAP_DBM's comment; SINR null (not assessed) counts as no interference. */
export function getRankScore(rsrpDbm: number, sinrDb: number | null, preferenceDb = 0): number {
  const sinrTerm = sinrDb === null ? 0 : Math.max(DOWNLINK_SHANNON.sinrMinDb, Math.min(getSinrAtMaxEfficiencyDb(), sinrDb));
  return Math.min(rsrpDbm, RSRP_SCORE_CAP_DBM) + SINR_SCORE_WEIGHT * sinrTerm + preferenceDb;
}

function kitLosses(kit: Kit, freqMhz: number, warnings: string[]) {
  const gain = interpolateGain(kit.antenna.gainTable, freqMhz);
  if (gain.isOutsideTable) warnings.push(`${kit.antenna.name} has no gain figure at ${formatNumber(freqMhz, 0)} MHz; the nearest one is used`);
  let cableLossDb = 0;
  let connectorLossDb = 0;
  if (kit.cable && kit.cableM > 0) {
    const cable = getCableLossDb(kit.cable.lossTable, freqMhz, kit.cableM);
    if (cable.approximate) warnings.push(`${kit.cable.name} loss at ${formatNumber(freqMhz, 0)} MHz is extrapolated (√f), approximate`);
    cableLossDb = cable.lossDb;
    connectorLossDb = getConnectorLossDb(kit.cable.connectors, kit.cable.connectorLossDb);
    if (cableLossDb + connectorLossDb > gain.gainDbi) {
      warnings.push(
        `${formatMetres(kit.cableM, 0)} of ${kit.cable.name} loses ${formatDb(cableLossDb + connectorLossDb)} at ${formatNumber(freqMhz, 0)} MHz, more than ${kit.antenna.name} gains (${formatDbi(gain.gainDbi)}): use a shorter run or a higher-gain antenna`,
      );
    }
  }
  return { gainDbi: gain.gainDbi, cableLossDb, connectorLossDb };
}

/** The modelled RSRP at a point for a cell (used for calibration residuals and for predictions). */
export function modelCellAt(
  cell: CandidateCell,
  at: LatLon,
  options: {
    receiveGainDbi: number;
    diffractionLossDb?: number;
    excessLossDb?: number;
    calibrationOffsetDb?: number;
    cableLossDb?: number;
    connectorLossDb?: number;
  },
): RsrpPrediction & { distanceM: number; sectorOffsetDeg: number | null; bearingFromMastDeg: number } {
  const distanceM = Math.max(1, getDistanceM(at, cell.mastPosition));
  const bearingFromMastDeg = getReverseBearing(at, cell.mastPosition);
  const sectorOffsetDeg = cell.sectorAzimuthDeg === null ? null : wrap180(bearingFromMastDeg - cell.sectorAzimuthDeg);
  const prediction = predictRsrp({
    freqMhz: cell.dlMhz,
    distanceM,
    rsEpreDbm: cell.rsPowerDbm ?? undefined,
    sectorOffsetDeg,
    diffractionLossDb: options.diffractionLossDb ?? 0,
    excessLossDb: options.excessLossDb ?? DEFAULT_EXCESS_LOSS_DB,
    customerGainDbi: options.receiveGainDbi,
    cableLossDb: options.cableLossDb ?? 0,
    connectorLossDb: options.connectorLossDb ?? 0,
    calibrationOffsetDb: options.calibrationOffsetDb ?? 0,
  });
  return { ...prediction, distanceM, sectorOffsetDeg, bearingFromMastDeg };
}

export function evaluateCandidate(cell: CandidateCell, ctx: CandidateContext, s: ShortlistSettings): ShortlistEntry {
  const warnings: string[] = [];
  const k = s.k ?? STANDARD_K_FACTOR;
  const mastHeightM = cell.antennaHeightM ?? DEFAULT_MAST_ANTENNA_HEIGHT_M;
  if (cell.antennaHeightM === null) warnings.push(`Mast antenna height unknown; ${DEFAULT_MAST_ANTENNA_HEIGHT_M} m assumed`);
  const bearingTrueDeg = getInitialBearing(s.customer, cell.mastPosition);
  const declinationDeg = s.declinationDeg ?? getDeclination({ lat: s.customer.lat, lon: s.customer.lon, date: s.date });

  // A position on the mast itself has a profile of zero length: there is no path to analyse.
  const terrain =
    ctx.profile && ctx.profile.length >= 2 && ctx.profile.at(-1)!.distanceM > 0
      ? analysePathProfile({ samples: ctx.profile, txHeightM: s.kit.mountHeightM, rxHeightM: mastHeightM, freqMhz: cell.dlMhz, k })
      : null;
  if (!terrain) warnings.push('No elevation data covers this path: terrain not checked');
  const diffractionLossDb = terrain?.diffractionLossDb ?? 0;
  const customerGround = ctx.profile?.[0]?.groundM ?? s.customerGroundM ?? 0;
  const mastGround = ctx.profile?.at(-1)?.groundM ?? cell.mastGroundM ?? customerGround;

  const kit = kitLosses(s.kit, cell.dlMhz, warnings);
  const calibrationOffsetDb = ctx.calibration?.offsetDb ?? 0;
  const modelled = modelCellAt(cell, s.customer, {
    receiveGainDbi: kit.gainDbi,
    diffractionLossDb,
    excessLossDb: s.excessLossDb,
    calibrationOffsetDb,
    cableLossDb: kit.cableLossDb,
    connectorLossDb: kit.connectorLossDb,
  });
  if (modelled.distanceM < AT_MAST_M) {
    warnings.push(`The position is at the mast (${formatDistance(modelled.distanceM)}): bearing and tilt mean nothing this close`);
  } else if (modelled.sectorOffsetDeg !== null && Math.abs(modelled.sectorOffsetDeg) > 60) {
    warnings.push(`The customer is ${formatDegrees(Math.abs(modelled.sectorOffsetDeg), 0)} off this sector's axis`);
  }

  let expectedGainDb: number | null = null;
  if (s.currentKit) {
    const current = kitLosses(s.currentKit, cell.dlMhz, []);
    // The current antenna usually sits lower (indoors, on the router): its own terrain case would differ,
    // but the comparison keeps the path the same and compares kit only.
    const before = predictRsrp({
      freqMhz: cell.dlMhz,
      distanceM: modelled.distanceM,
      rsEpreDbm: cell.rsPowerDbm ?? undefined,
      sectorOffsetDeg: modelled.sectorOffsetDeg,
      diffractionLossDb,
      excessLossDb: s.excessLossDb ?? DEFAULT_EXCESS_LOSS_DB,
      customerGainDbi: current.gainDbi,
      cableLossDb: current.cableLossDb,
      connectorLossDb: current.connectorLossDb,
      calibrationOffsetDb,
    });
    expectedGainDb = modelled.rsrpDbm - before.rsrpDbm;
    if (expectedGainDb < 0) {
      warnings.push(`This kit predicts ${formatDb(-expectedGainDb)} dB less than ${s.currentKit.antenna.name}: the install would make the signal worse`);
    }
  }

  const preferred = !!s.preferredOperatorId && s.preferredOperatorId === cell.operatorId;
  const preferenceDb = preferred ? (s.operatorPreferenceDb ?? DEFAULT_OPERATOR_PREFERENCE_DB) : 0;
  return {
    cell,
    distanceM: modelled.distanceM,
    bearingTrueDeg,
    bearingMagneticDeg: getMagneticBearing(bearingTrueDeg, declinationDeg),
    declinationDeg,
    bearingFromMastDeg: modelled.bearingFromMastDeg,
    sectorOffsetDeg: modelled.sectorOffsetDeg,
    elevationDeg: getElevationAngleDeg({
      fromHeightM: customerGround + s.kit.mountHeightM,
      toHeightM: mastGround + mastHeightM,
      distanceM: modelled.distanceM,
      k,
    }),
    terrain: {
      status: terrain?.classification ?? 'unknown',
      worstClearanceM: terrain?.worst?.clearanceM ?? null,
      worstDistanceM: terrain?.worst?.distanceM ?? null,
      diffractionLossDb,
    },
    prediction: modelled,
    predictedRsrpDbm: modelled.rsrpDbm,
    expectedGainDb,
    grade: gradeSignal(cell.tech === 'nr' ? 'nrSsRsrp' : 'lteRsrp', modelled.rsrpDbm),
    calibration: ctx.calibration,
    preferred,
    sinrDb: null,
    sinrGrade: null,
    interferers: 0,
    expectedThroughputMbps: null,
    bandwidthMhz: cell.bandwidthMhz ?? DEFAULT_BANDWIDTH_MHZ,
    score: getRankScore(modelled.rsrpDbm, null, preferenceDb),
    warnings: cell.bandwidthMhz == null ? [...warnings, `Carrier bandwidth unknown; ${DEFAULT_BANDWIDTH_MHZ} MHz assumed for the throughput`] : warnings,
  };
}

const isCoChannel = (a: CandidateCell, b: CandidateCell) =>
  a.cellId !== b.cellId && a.operatorId === b.operatorId && a.tech === b.tech && a.channel === b.channel;

/**
 * SINR, expected throughput and rank score of each entry, counting the same operator's other cells on the
 * same channel among the entries as interference (their predicted RSRP at the customer, summed in mW).
 */
export function assessLinkQuality(
  entries: ShortlistEntry[],
  options: { sinr?: SinrOptions; operatorPreferenceDb?: number; ports?: number } = {},
): ShortlistEntry[] {
  return entries.map((e) => {
    const neighbours = entries.filter((o) => isCoChannel(e.cell, o.cell));
    const sinrDb = getSinrDb(
      e.predictedRsrpDbm,
      neighbours.map((o) => o.predictedRsrpDbm),
      options.sinr,
    );
    const strongest = neighbours.reduce<ShortlistEntry | null>((best, o) => (!best || o.predictedRsrpDbm > best.predictedRsrpDbm ? o : best), null);
    const warnings = [...e.warnings];
    if (strongest && e.predictedRsrpDbm - strongest.predictedRsrpDbm < SECTOR_EDGE_MARGIN_DB) {
      warnings.push(
        `Sector edge: ${strongest.cell.mastName} (PCI ${strongest.cell.pci ?? '?'}) on the same channel is only ${formatDb(e.predictedRsrpDbm - strongest.predictedRsrpDbm)} dB weaker, SINR ${formatDb(sinrDb)} dB`,
      );
    }
    const preferenceDb = e.preferred ? (options.operatorPreferenceDb ?? DEFAULT_OPERATOR_PREFERENCE_DB) : 0;
    return {
      ...e,
      sinrDb,
      sinrGrade: gradeSignal(e.cell.tech === 'nr' ? 'nrSsSinr' : 'lteSinr', sinrDb),
      interferers: neighbours.length,
      expectedThroughputMbps: getExpectedThroughputMbps(sinrDb, e.bandwidthMhz, { ports: options.ports }),
      score: getRankScore(e.predictedRsrpDbm, sinrDb, preferenceDb),
      warnings,
    };
  });
}

/** Ranks candidates by score (RSRP, SINR once assessed, operator preference); ties go to the nearer mast. */
export function rankShortlist(entries: ShortlistEntry[]): ShortlistEntry[] {
  return [...entries].sort((a, b) => b.score - a.score || a.distanceM - b.distanceM);
}
