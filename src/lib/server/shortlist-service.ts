// Builds the shortlist for one position: candidate cells from the database, terrain from the
// elevation data, calibration from nearby readings, kit from the catalogue; ranking is domain code.
import type { Tx } from './db';
import type { LatLon } from '../domain/geodesy';
import type { ElevationProfile } from '../domain/elevation-grid';
import type { ProfileSample } from '../domain/terrain';
import { analysePathProfile } from '../domain/terrain';
import {
  DEFAULT_SEARCH_RADIUS_M,
  DEFAULT_MAST_ANTENNA_HEIGHT_M,
  assessLinkQuality,
  evaluateCandidate,
  modelCellAt,
  rankShortlist,
  type CandidateCell,
  type Kit,
  type ShortlistEntry,
} from '../domain/shortlist';
import { shrinkCalibration, summariseResiduals, type Calibration, type ResidualSummary } from '../domain/calibration';
import { findCandidateCell, listCandidateCells, listNearbyReadings, type MeasuredReading } from './repos/candidates';
import { getDataVersion } from './data-version';
import { ValidationError } from './errors';
import { findAntenna, findCable, listAntennas, type Antenna, type Cable } from './repos/catalogue';
import { formatMetres } from '../domain/format';
import { getDeclination } from '../domain/declination';

export type ProfileProvider = (from: LatLon, to: LatLon, options: { maxSamples: number }) => Promise<ElevationProfile | null>;

/** Readings are usually taken by hand or from a vehicle — common practice, no source. */
export const READING_HEIGHT_M = 1.5;
/** The reading device's antenna gain (a phone or router's own) — common practice, no source. */
export const READING_ANTENNA_GAIN_DBI = 0;
export const CALIBRATION_RADIUS_M = 8000;
export const CALIBRATION_READINGS_PER_CELL = 20;
export const MAX_CANDIDATES = 60;

export interface ShortlistRequest {
  at: LatLon;
  heightM: number;
  antennaId?: string;
  cableId?: string;
  cableM: number;
  currentAntennaId?: string;
  preferredOperatorId?: string;
  /** Only this operator's cells (the customer's SIM), a hard filter. */
  requiredOperatorId?: string;
  radiusM?: number;
  date: Date;
}

export interface ShortlistResult {
  entries: (ShortlistEntry & { operatorColour: string | null })[];
  kit: Kit;
  currentKit: Kit | null;
  customerGroundM: number | null;
  radiusM: number;
  candidatesConsidered: number;
  /** About the position itself (at sea, outside every elevation grid). */
  warnings: string[];
}

function toKit(antenna: Antenna, cable: Cable | null, cableM: number, mountHeightM: number): Kit {
  return {
    antenna: { id: antenna.id, name: antenna.name, gainTable: antenna.gainTable, horizontalBeamwidthDeg: antenna.horizontalBeamwidthDeg, ports: antenna.ports },
    cable: cable && { id: cable.id, name: cable.name, lossTable: cable.lossTable, connectorLossDb: cable.connectorLossDb, connectors: cable.connectors },
    cableM: cable ? cableM : 0,
    mountHeightM,
  };
}

/** Samples for the terrain analysis, or null unless elevation data covers the whole path. */
function toSamples(profile: ElevationProfile | null): ProfileSample[] | null {
  if (!profile || !profile.coverage.complete || !(profile.distanceM > 0)) return null;
  return profile.points.map((p) => ({ distanceM: p.distanceM, groundM: p.groundM as number }));
}

/**
 * What the stored residuals were computed with: the propagation model's revision (raise it whenever
 * modelCellAt, the terrain analysis or the reading defaults change what a residual comes to) and the
 * elevation data version. A stored residual with another basis counts as missing.
 */
export const RESIDUAL_MODEL_REVISION = 1;

export async function getResidualBasis(db: Tx): Promise<string> {
  return `model ${RESIDUAL_MODEL_REVISION}, elevation ${await getDataVersion(db, 'elevation')}`;
}

/** A reading's residual against the model: measured minus modelled RSRP, in dB. */
export async function computeResidualDb(cell: CandidateCell, r: MeasuredReading, profileFor: ProfileProvider): Promise<number> {
  const samples = toSamples(await profileFor(r.position, cell.mastPosition, { maxSamples: 64 }));
  const diffraction = samples
    ? analysePathProfile({
        samples,
        txHeightM: r.heightM ?? READING_HEIGHT_M,
        rxHeightM: cell.antennaHeightM ?? DEFAULT_MAST_ANTENNA_HEIGHT_M,
        freqMhz: cell.dlMhz,
      }).diffractionLossDb
    : 0;
  const modelled = modelCellAt(cell, r.position, { receiveGainDbi: r.antennaGainDbi ?? READING_ANTENNA_GAIN_DBI, diffractionLossDb: diffraction });
  return r.rsrpDbm - modelled.rsrpDbm;
}

/**
 * Residual summaries (count, median, spread of measured − modelled) of each cell's readings nearest
 * the customer: the one place that aggregates readings for calibration (the shrinkage rule is domain
 * code). Residuals stored by the residual job are read as they are; readings it has not reached yet
 * (or whose basis is stale) are computed here.
 */
async function summariseCellResiduals(db: Tx, cells: CandidateCell[], at: LatLon, profileFor: ProfileProvider): Promise<Map<string, ResidualSummary | null>> {
  // One after the other: `db` may be a transaction, and one connection runs one query at a time.
  const basis = await getResidualBasis(db);
  const readings = await listNearbyReadings(
    db,
    cells.map((c) => c.cellId),
    at,
    CALIBRATION_RADIUS_M,
    CALIBRATION_READINGS_PER_CELL,
  );
  const byCell = new Map(cells.map((c) => [c.cellId, c]));
  const residuals = new Map<string, number[]>();
  for (const r of readings) {
    const stored = r.residualBasis === basis ? r.residualDb : null;
    const residual = stored ?? (await computeResidualDb(byCell.get(r.cellId)!, r, profileFor));
    const list = residuals.get(r.cellId) ?? [];
    list.push(residual);
    residuals.set(r.cellId, list);
  }
  return new Map(cells.map((c) => [c.cellId, summariseResiduals(residuals.get(c.cellId) ?? [])]));
}

async function calibrate(db: Tx, cells: CandidateCell[], at: LatLon, profileFor: ProfileProvider): Promise<Map<string, Calibration | null>> {
  const summaries = await summariseCellResiduals(db, cells, at, profileFor);
  return new Map(cells.map((c) => [c.cellId, shrinkCalibration(summaries.get(c.cellId) ?? null)]));
}

async function resolveKits(db: Tx, req: Pick<ShortlistRequest, 'antennaId' | 'cableId' | 'cableM' | 'heightM' | 'currentAntennaId'>) {
  const antennas = await listAntennas(db);
  const antenna = req.antennaId ? await findAntenna(db, req.antennaId) : (antennas.find((a) => a.kind === 'directional') ?? antennas[0]);
  if (!antenna) throw new ValidationError('The antenna catalogue is empty: add an antenna first', { antenna_id: ['No antenna in the catalogue'] });
  const cable = req.cableId ? await findCable(db, req.cableId) : null;
  const current = req.currentAntennaId ? await findAntenna(db, req.currentAntennaId) : (antennas.find((a) => a.kind === 'stub') ?? null);
  // The current antenna is taken as mounted indoors at the router, without a feeder.
  return { kit: toKit(antenna, cable, req.cableM, req.heightM), currentKit: current ? toKit(current, null, 0, 2) : null };
}

export async function buildShortlist(db: Tx, req: ShortlistRequest, profileFor: ProfileProvider): Promise<ShortlistResult> {
  const { kit, currentKit } = await resolveKits(db, req);
  const radiusM = req.radiusM ?? DEFAULT_SEARCH_RADIUS_M;
  const cells = await listCandidateCells(db, { at: req.at, radiusM, limit: MAX_CANDIDATES, operatorId: req.requiredOperatorId });
  return evaluateCells(db, cells, req, kit, currentKit, radiusM, profileFor);
}

/**
 * The figures of one chosen cell for a customer and kit (plan figures, aim sheet), with the same
 * operator's co-channel cells nearby counted for its SINR; null without a frequency.
 */
export async function evaluatePlannedCell(
  db: Tx,
  cellId: string,
  req: Omit<ShortlistRequest, 'radiusM' | 'preferredOperatorId' | 'requiredOperatorId'>,
  profileFor: ProfileProvider,
): Promise<ShortlistResult['entries'][number] | null> {
  const cell = await findCandidateCell(db, cellId);
  if (!cell) return null;
  const { kit, currentKit } = await resolveKits(db, req);
  const nearby = await listCandidateCells(db, { at: req.at, radiusM: DEFAULT_SEARCH_RADIUS_M, limit: MAX_CANDIDATES, operatorId: cell.operatorId });
  const neighbours = nearby.filter((c) => c.cellId !== cell.cellId && c.tech === cell.tech && c.channel === cell.channel);
  const result = await evaluateCells(db, [cell, ...neighbours], req, kit, currentKit, 0, profileFor);
  return result.entries.find((e) => e.cell.cellId === cell.cellId) ?? null;
}

/** Below this ground height (m above sea level) a position is probably offshore. */
const SEA_LEVEL_M = 0;

function getPositionWarnings(groundM: number | null): string[] {
  if (groundM === null) return ['No elevation grid covers this position: terrain, clearance and tilt are not checked'];
  if (groundM <= SEA_LEVEL_M) return [`The ground here is ${formatMetres(groundM, 0)} above sea level: the position may be at sea, check it`];
  return [];
}

async function evaluateCells(
  db: Tx,
  cells: (CandidateCell & { operatorColour: string | null })[],
  req: ShortlistRequest,
  kit: Kit,
  currentKit: Kit | null,
  radiusM: number,
  profileFor: ProfileProvider,
): Promise<ShortlistResult> {
  const calibration = await calibrate(db, cells, req.at, profileFor);
  const profiles = new Map<string, ElevationProfile | null>();
  for (const cell of cells) {
    if (!profiles.has(cell.mastId)) profiles.set(cell.mastId, await profileFor(req.at, cell.mastPosition, { maxSamples: 400 }));
  }
  const customerGroundM =
    [...profiles.values()].find((p) => p?.points[0]?.groundM != null)?.points[0]?.groundM ??
    (await profileFor(req.at, req.at, { maxSamples: 2 }))?.points[0]?.groundM ??
    null;
  const settings = {
    customer: req.at,
    customerGroundM,
    date: req.date,
    declinationDeg: getDeclination({ lat: req.at.lat, lon: req.at.lon, date: req.date }),
    kit,
    currentKit,
    preferredOperatorId: req.preferredOperatorId ?? null,
  };
  const evaluated = cells.map((cell) => ({
    ...evaluateCandidate(cell, { profile: toSamples(profiles.get(cell.mastId) ?? null), calibration: calibration.get(cell.cellId) ?? null }, settings),
    operatorColour: cell.operatorColour,
  }));
  const entries = rankShortlist(assessLinkQuality(evaluated, { ports: kit.antenna.ports })) as ShortlistResult['entries'];
  return { entries, kit, currentKit, customerGroundM, radiusM, candidatesConsidered: cells.length, warnings: getPositionWarnings(customerGroundM) };
}
