import geomagnetism from 'geomagnetism';
import { normaliseBearing } from './geodesy';

export interface GeomagneticInput {
  lat: number;
  lon: number;
  /** Height above the WGS84 ellipsoid in metres; ground level is close enough for aiming. */
  heightM?: number;
  date: Date;
}

export interface GeomagneticField {
  /** D, degrees, positive when magnetic north lies east of true north. */
  declinationDeg: number;
  /** I, degrees, positive downwards. */
  inclinationDeg: number;
  horizontalIntensityNt: number;
  totalIntensityNt: number;
  /** e.g. "WMM-2025"; the package picks the model whose release window contains the date. */
  modelName: string;
  /** False when the date lies outside the model's official five-year span, so the value is extrapolated. */
  isWithinModelValidity: boolean;
}

type TimedModel = ReturnType<typeof geomagnetism.model>;
let lastModel: { time: number; model: TimedModel } | null = null;

/**
 * The model's coefficients carried to a date. Building them costs as much as evaluating a point, and
 * a shortlist or a plan asks for one date many times, so the last one is kept (reading a point does
 * not change the model).
 */
function modelAt(date: Date): TimedModel {
  const time = date.getTime();
  if (lastModel?.time !== time) lastModel = { time, model: geomagnetism.model(date, { allowOutOfBoundsModel: true }) };
  return lastModel.model;
}

/**
 * Main-field elements from the World Magnetic Model (WMM2025 for 2025–2029, NOAA NCEI / BGS, through the `geomagnetism` package).
 *
 * The package's own WMM2025 window ends 2029-11-13 although the model is valid to the end of 2029, so
 * out-of-window dates are allowed; the package then writes one warning line to the console. Local
 * crustal anomalies can differ from the model by well over 0.1°.
 */
export function getGeomagneticField({ lat, lon, heightM = 0, date }: GeomagneticInput): GeomagneticField {
  const model = modelAt(date);
  // The package takes height in km, above the WGS84 ellipsoid (read from its source).
  const field = model.point([lat, lon, heightM / 1000]);
  const validFrom = Date.UTC(model.epoch, 0, 1);
  const validTo = Date.UTC(model.epoch + 5, 0, 1);
  return {
    declinationDeg: field.decl,
    inclinationDeg: field.incl,
    horizontalIntensityNt: field.h,
    totalIntensityNt: field.f,
    modelName: model.name,
    isWithinModelValidity: date.getTime() >= validFrom && date.getTime() < validTo,
  };
}

/** Magnetic declination D in degrees (+ east) at a place and date. */
export function getDeclination(input: GeomagneticInput): number {
  return getGeomagneticField(input).declinationDeg;
}

/** Magnetic bearing = true bearing − D, in [0, 360) (WMM sign convention: D positive east). */
export function getMagneticBearing(trueBearingDeg: number, declinationDeg: number): number {
  return normaliseBearing(trueBearingDeg - declinationDeg);
}

/**
 * One-sigma global declination uncertainty of WMM2025, σ_D = √(0.26² + (5417/H)²) degrees with H in nT
 * (WMM2025 technical report error model, via a third-party summary — from memory, verify). It grows where
 * the horizontal field is weak (high latitudes), where a compass is least trustworthy.
 */
export function getDeclinationUncertaintyDeg(horizontalIntensityNt: number): number {
  return Math.hypot(0.26, 5417 / horizontalIntensityNt);
}
