/**
 * Ranking candidate cells for one customer address (the shortlist).
 *
 * Model (Bearline's own, documented defaults):
 *   predicted RSRP = RS EPRE + mast gain − mast feeder − free space − terrain diffraction − clutter/excess
 *                    − sector pattern loss + customer antenna gain − cable − connectors + calibration
 * (Bearline's own model). Terrain diffraction comes from the elevation profile where one covers the path
 * (single knife edge on the worst obstacle, ITU-R P.526). The clutter/excess term is one flat value for
 * rural paths, and each cell's readings shift its prediction by their median residual (calibration).
 */
import { getDistanceM, getInitialBearing, getReverseBearing, wrap180, type LatLon } from './geodesy';
import { getDeclination, getMagneticBearing } from './declination';
import { getCableLossDb, getConnectorLossDb, interpolateGain, predictRsrp, type CableLossPoint, type GainPoint, type RsrpPrediction } from './link-budget';
import { analysePathProfile, getElevationAngleDeg, STANDARD_K_FACTOR, type PathClassification, type ProfileSample } from './terrain';
import { gradeSignal, type SignalGrade } from './measurements';

/** Flat clutter/excess loss for rural paths beyond free space and terrain — common practice, no source. */
export const DEFAULT_EXCESS_LOSS_DB = 15;
/** A preferred operator's cells rank as if this much stronger — common practice, no source. */
export const DEFAULT_OPERATOR_PREFERENCE_DB = 6;
/** Calibration shifts are clamped: a handful of odd readings must not swing a prediction wildly. */
export const MAX_CALIBRATION_SHIFT_DB = 20;
export const DEFAULT_SEARCH_RADIUS_M = 35_000;
/** Mast antenna height when a cell does not record one — common practice, no source. */
export const DEFAULT_MAST_ANTENNA_HEIGHT_M = 25;

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
}

export interface AntennaSpec {
  id: string;
  name: string;
  gainTable: GainPoint[];
  horizontalBeamwidthDeg: number | null;
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

export interface Calibration {
  offsetDb: number;
  readingsUsed: number;
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
  kit: Kit;
  /** The customer's current antenna (e.g. the router's own) for the expected improvement. */
  currentKit: Kit | null;
  preferredOperatorId?: string | null;
  excessLossDb?: number;
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
  /** Rank score: predicted RSRP plus the operator preference. */
  score: number;
  warnings: string[];
}

/** The median residual (measured − modelled) of a cell's readings, clamped; null without readings. */
export function getCalibration(residualsDb: number[]): Calibration | null {
  const values = residualsDb.filter(Number.isFinite).sort((a, b) => a - b);
  if (values.length === 0) return null;
  const mid = Math.floor(values.length / 2);
  const median = values.length % 2 ? values[mid]! : (values[mid - 1]! + values[mid]!) / 2;
  return { offsetDb: Math.max(-MAX_CALIBRATION_SHIFT_DB, Math.min(MAX_CALIBRATION_SHIFT_DB, median)), readingsUsed: values.length };
}

function kitLosses(kit: Kit, freqMhz: number, warnings: string[]) {
  const gain = interpolateGain(kit.antenna.gainTable, freqMhz);
  if (gain.isOutsideTable) warnings.push(`${kit.antenna.name} has no gain figure at ${freqMhz.toFixed(0)} MHz; the nearest one is used`);
  let cableLossDb = 0;
  let connectorLossDb = 0;
  if (kit.cable && kit.cableM > 0) {
    const cable = getCableLossDb(kit.cable.lossTable, freqMhz, kit.cableM);
    if (cable.approximate) warnings.push(`${kit.cable.name} loss at ${freqMhz.toFixed(0)} MHz is extrapolated (√f), approximate`);
    cableLossDb = cable.lossDb;
    connectorLossDb = getConnectorLossDb(kit.cable.connectors, kit.cable.connectorLossDb);
  }
  return { gainDbi: gain.gainDbi, cableLossDb, connectorLossDb };
}

/** The modelled RSRP at a point for a cell (used for calibration residuals and for predictions). */
export function modelCellAt(
  cell: CandidateCell,
  at: LatLon,
  options: { receiveGainDbi: number; diffractionLossDb?: number; excessLossDb?: number; calibrationOffsetDb?: number; cableLossDb?: number; connectorLossDb?: number },
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
  const declinationDeg = getDeclination({ lat: s.customer.lat, lon: s.customer.lon, date: s.date });

  const terrain = ctx.profile && ctx.profile.length >= 2
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
  if (modelled.sectorOffsetDeg !== null && Math.abs(modelled.sectorOffsetDeg) > 60) {
    warnings.push(`The customer is ${Math.abs(modelled.sectorOffsetDeg).toFixed(0)}° off this sector's axis`);
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
  }

  const preferred = s.preferredOperatorId && s.preferredOperatorId === cell.operatorId;
  return {
    cell,
    distanceM: modelled.distanceM,
    bearingTrueDeg,
    bearingMagneticDeg: getMagneticBearing(bearingTrueDeg, declinationDeg),
    declinationDeg,
    bearingFromMastDeg: modelled.bearingFromMastDeg,
    sectorOffsetDeg: modelled.sectorOffsetDeg,
    elevationDeg: getElevationAngleDeg({ fromHeightM: customerGround + s.kit.mountHeightM, toHeightM: mastGround + mastHeightM, distanceM: modelled.distanceM, k }),
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
    score: modelled.rsrpDbm + (preferred ? (s.operatorPreferenceDb ?? DEFAULT_OPERATOR_PREFERENCE_DB) : 0),
    warnings,
  };
}

/** Ranks candidates by predicted RSRP with the operator preference applied; ties go to the nearer mast. */
export function rankShortlist(entries: ShortlistEntry[]): ShortlistEntry[] {
  return [...entries].sort((a, b) => b.score - a.score || a.distanceM - b.distanceM);
}
