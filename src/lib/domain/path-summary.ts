// The figures a planner or installer needs for one customer → mast path.
import { getDistanceM, getInitialBearing, getReverseBearing, type LatLon } from './geodesy';
import { getDeclination, getMagneticBearing } from './declination';
import { getFreeSpacePathLossDb } from './link-budget';
import {
  STANDARD_K_FACTOR,
  analysePathProfile,
  getEarthBulgeM,
  getElevationAngleDeg,
  getFresnelRadiusM,
  getMaxLineOfSightKm,
  type PathProfileAnalysis,
  type ProfileSample,
} from './terrain';

export interface PathInput {
  /** The customer's antenna. */
  from: LatLon;
  /** The mast. */
  to: LatLon;
  freqMhz?: number;
  /** Antenna heights above their own ground, metres. */
  fromHeightM: number;
  toHeightM: number;
  /** Ground elevation at each end (0 when unknown: both ends then share one datum). */
  fromGroundM?: number;
  toGroundM?: number;
  k?: number;
  /** Date for the magnetic declination (the model changes year by year). */
  date: Date;
  /** Ground heights from the customer (0 m) to the mast, when elevation data covers the path. */
  profile?: ProfileSample[];
}

export interface PathSummary {
  distanceM: number;
  bearingTrueDeg: number;
  bearingMagneticDeg: number;
  declinationDeg: number;
  reverseBearingTrueDeg: number;
  elevationDeg: number;
  fsplDb: number | null;
  fresnelRadiusMidM: number | null;
  earthBulgeMidM: number;
  radioHorizonKm: number;
  k: number;
  terrain: PathProfileAnalysis | null;
}

export function summarisePath(input: PathInput): PathSummary {
  const k = input.k ?? STANDARD_K_FACTOR;
  const distanceM = getDistanceM(input.from, input.to);
  const bearingTrueDeg = getInitialBearing(input.from, input.to);
  const declinationDeg = getDeclination({ lat: input.from.lat, lon: input.from.lon, date: input.date });
  const fromGround = input.profile?.[0]?.groundM ?? input.fromGroundM ?? 0;
  const toGround = input.profile?.at(-1)?.groundM ?? input.toGroundM ?? 0;
  const half = distanceM / 2;
  const terrain =
    input.profile && input.profile.length >= 2 && input.freqMhz && distanceM > 0
      ? analysePathProfile({ samples: input.profile, txHeightM: input.fromHeightM, rxHeightM: input.toHeightM, freqMhz: input.freqMhz, k })
      : null;
  return {
    distanceM,
    bearingTrueDeg,
    bearingMagneticDeg: getMagneticBearing(bearingTrueDeg, declinationDeg),
    declinationDeg,
    reverseBearingTrueDeg: getReverseBearing(input.from, input.to),
    elevationDeg: getElevationAngleDeg({ fromHeightM: fromGround + input.fromHeightM, toHeightM: toGround + input.toHeightM, distanceM, k }),
    fsplDb: input.freqMhz && distanceM > 0 ? getFreeSpacePathLossDb(input.freqMhz, distanceM / 1000) : null,
    fresnelRadiusMidM: input.freqMhz && distanceM > 0 ? getFresnelRadiusM(half, half, input.freqMhz) : null,
    earthBulgeMidM: getEarthBulgeM(half, half, k),
    radioHorizonKm: getMaxLineOfSightKm(input.fromHeightM, input.toHeightM, k),
    k,
    terrain,
  };
}
