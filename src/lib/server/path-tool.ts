// The path calculator: domain figures plus the terrain profile where elevation data covers the path.
import { summarisePath, type PathSummary } from '../domain/path-summary';
import type { PathJson, PathQuery } from '../schemas/tools';
import type { ElevationProfile } from '../domain/elevation-grid';
import type { ProfileSample } from '../domain/terrain';
import { getElevationProfile } from './elevation-service';
import { formatDistance, formatPercent } from '../domain/format';

/** Samples along the path for the terrain profile and chart. */
export const PATH_PROFILE_SAMPLES = 400;

export interface PathToolResult {
  summary: PathSummary;
  date: Date;
  terrainNote: string | null;
}

function describeCoverage(profile: ElevationProfile): string | null {
  const c = profile.coverage;
  if (c.complete) return null;
  if (c.coveredCount === 0) return 'No elevation data covers this path: terrain not checked.';
  return `Elevation data covers ${formatPercent(c.fraction)} of the path (missing from ${formatDistance(c.firstMissingDistanceM ?? 0)}): terrain not checked.`;
}

export async function calculatePath(q: PathQuery, now: Date): Promise<PathToolResult> {
  const date = q.date ?? now;
  const elevation = await getElevationProfile(q.from, q.to, { maxSamples: PATH_PROFILE_SAMPLES });
  const complete = elevation.coverage.complete;
  const profile: ProfileSample[] | undefined = complete ? elevation.points.map((p) => ({ distanceM: p.distanceM, groundM: p.groundM as number })) : undefined;
  const summary = summarisePath({
    from: q.from,
    to: q.to,
    freqMhz: q.freq_mhz,
    fromHeightM: q.h1_m,
    toHeightM: q.h2_m,
    k: q.k,
    date,
    profile,
  });
  const terrainNote = !complete ? describeCoverage(elevation) : q.freq_mhz ? null : 'Give a frequency to check the Fresnel zone and terrain.';
  return { summary, date, terrainNote };
}

const r = (n: number, d: number) => Math.round(n * 10 ** d) / 10 ** d;

/** API shape: snake_case with units in the names. */
export function toPathResponse({ summary: s, date, terrainNote }: PathToolResult): PathJson {
  return {
    distance_m: r(s.distanceM, 1),
    bearing_true_deg: r(s.bearingTrueDeg, 3),
    bearing_magnetic_deg: r(s.bearingMagneticDeg, 3),
    declination_deg: r(s.declinationDeg, 3),
    declination_date: date.toISOString().slice(0, 10),
    reverse_bearing_true_deg: r(s.reverseBearingTrueDeg, 3),
    elevation_deg: r(s.elevationDeg, 4),
    fspl_db: s.fsplDb === null ? null : r(s.fsplDb, 2),
    fresnel_radius_mid_m: s.fresnelRadiusMidM === null ? null : r(s.fresnelRadiusMidM, 2),
    earth_bulge_mid_m: r(s.earthBulgeMidM, 2),
    radio_horizon_km: r(s.radioHorizonKm, 2),
    k: r(s.k, 4),
    terrain: s.terrain && {
      status: s.terrain.classification,
      worst_clearance_m: s.terrain.worst ? r(s.terrain.worst.clearanceM, 2) : null,
      worst_distance_m: s.terrain.worst ? r(s.terrain.worst.distanceM, 1) : null,
      nu: s.terrain.worst ? r(s.terrain.worst.nu, 3) : null,
      diffraction_loss_db: r(s.terrain.diffractionLossDb, 2),
      profile: s.terrain.samples.map((p) => ({
        distance_m: r(p.distanceM, 1),
        ground_m: r(p.groundM, 1),
        bulge_m: r(p.bulgeM, 2),
        los_m: r(p.losM, 2),
        fresnel_m: r(p.fresnelM, 2),
        clearance_m: r(p.clearanceM, 2),
      })),
    },
    ...(terrainNote ? { terrain_note: terrainNote } : {}),
  };
}
