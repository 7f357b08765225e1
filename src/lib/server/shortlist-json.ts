// API shape of the shortlist: snake_case, units in the names.
import type { ShortlistResult } from './shortlist-service';
import type { ShortlistItemJson, ShortlistJson } from '../schemas/shortlist';

const r = (n: number, d: number) => Math.round(n * 10 ** d) / 10 ** d;
const rn = (n: number | null, d: number) => (n === null ? null : r(n, d));

type Entry = ShortlistResult['entries'][number];

/** One candidate as the API gives it; plan figures are this row too. */
export function shortlistItemJson(e: Entry, rank: number): ShortlistItemJson {
  return {
    rank,
    cell_id: e.cell.cellId,
    mast: { id: e.cell.mastId, name: e.cell.mastName, lat: e.cell.mastPosition.lat, lon: e.cell.mastPosition.lon, ground_m: rn(e.cell.mastGroundM, 1) },
    operator: { id: e.cell.operatorId, name: e.cell.operatorName, colour: e.operatorColour },
    preferred: e.preferred,
    tech: e.cell.tech,
    band: e.cell.band,
    channel: e.cell.channel,
    freq_mhz: e.cell.dlMhz,
    bandwidth_mhz: e.bandwidthMhz,
    pci: e.cell.pci,
    sector_azimuth_deg: e.cell.sectorAzimuthDeg,
    antenna_height_m: e.cell.antennaHeightM,
    distance_m: r(e.distanceM, 1),
    bearing_true_deg: r(e.bearingTrueDeg, 2),
    bearing_magnetic_deg: r(e.bearingMagneticDeg, 2),
    declination_deg: r(e.declinationDeg, 2),
    bearing_from_mast_deg: r(e.bearingFromMastDeg, 2),
    sector_offset_deg: rn(e.sectorOffsetDeg, 1),
    elevation_deg: r(e.elevationDeg, 3),
    terrain: {
      status: e.terrain.status,
      worst_clearance_m: rn(e.terrain.worstClearanceM, 1),
      worst_distance_m: rn(e.terrain.worstDistanceM, 0),
      diffraction_loss_db: r(e.terrain.diffractionLossDb, 2),
    },
    path_loss_db: r(e.prediction.pathLossDb, 2),
    predicted_rsrp_dbm: r(e.predictedRsrpDbm, 1),
    expected_gain_db: rn(e.expectedGainDb, 1),
    grade: e.grade,
    sinr_db: rn(e.sinrDb, 1),
    sinr_grade: e.sinrGrade,
    interferers: e.interferers,
    expected_throughput_mbps: rn(e.expectedThroughputMbps, 1),
    score: r(e.score, 2),
    calibration: e.calibration && {
      readings_used: e.calibration.readingsUsed,
      median_residual_db: r(e.calibration.medianResidualDb, 1),
      residual_db: r(e.calibration.offsetDb, 1),
      weight: r(e.calibration.weight, 2),
      uncertainty_db: r(e.calibration.uncertaintyDb, 1),
      confidence: e.calibration.confidence,
    },
    budget: e.prediction.terms.map((t) => ({ key: t.key, label: t.label, db: r(t.db, 2) })),
    warnings: e.warnings,
  };
}

export function shortlistJson(result: ShortlistResult, at: { lat: number; lon: number }, requiredOperatorId: string | null = null): ShortlistJson {
  return {
    lat: at.lat,
    lon: at.lon,
    radius_m: result.radiusM,
    customer_ground_m: rn(result.customerGroundM, 1),
    kit: {
      antenna: { id: result.kit.antenna.id, name: result.kit.antenna.name },
      cable: result.kit.cable && { id: result.kit.cable.id, name: result.kit.cable.name },
      cable_m: result.kit.cableM,
      height_m: result.kit.mountHeightM,
    },
    current_antenna: result.currentKit && { id: result.currentKit.antenna.id, name: result.currentKit.antenna.name },
    required_operator_id: requiredOperatorId,
    warnings: result.warnings,
    items: result.entries.map((e, i) => shortlistItemJson(e, i + 1)),
    total: result.entries.length,
  };
}
