import { describe, expect, it } from 'vitest';
import { summarisePath } from '../../src/lib/domain/path-summary';
import { getDestination } from '../../src/lib/domain/geodesy';

describe('summarisePath', () => {
  // WGS84 case G2 (geographiclib-geodesic 2.2.0 Inverse): 5543.139 m, azi1 45.825423°; spherical within 0.6 % / 0.2°.
  // Declination W1 at 2026-01-01 = +1.11° (WMM2025 via geomagnetism 0.2.0); magnetic = true − D (WMM sign convention).
  const g2 = summarisePath({
    from: { lat: 52.2053, lon: 0.1218 },
    to: { lat: 52.24, lon: 0.18 },
    fromHeightM: 6,
    toHeightM: 30,
    freqMhz: 806,
    date: new Date('2026-01-01T00:00:00Z'),
  });

  it('gives distance and true bearing close to the ellipsoidal values', () => {
    expect(Math.abs(g2.distanceM - 5543.139) / 5543.139).toBeLessThan(0.006);
    expect(Math.abs(g2.bearingTrueDeg - 45.825423)).toBeLessThan(0.2);
  });

  it('turns the true bearing into a magnetic one with the WMM2025 declination', () => {
    expect(g2.declinationDeg).toBeCloseTo(1.11, 1);
    expect(g2.bearingMagneticDeg).toBeCloseTo(g2.bearingTrueDeg - g2.declinationDeg, 9);
  });

  it('computes the reverse bearing from the mast end, not by adding 180°', () => {
    // G2: azi2 at point 2 = 45.871424°, so mast → customer = 225.871424° (geographiclib-geodesic)
    expect(Math.abs(g2.reverseBearingTrueDeg - 225.871424)).toBeLessThan(0.2);
  });

  it('matches the free-space, Fresnel and elevation check values over a 10 km path', () => {
    const from = { lat: -47.2, lon: -128.5 };
    const to = getDestination(from, 10_000, 0);
    const s = summarisePath({ from, to, fromHeightM: 8, toHeightM: 48, freqMhz: 806, date: new Date('2026-06-01T00:00:00Z') });
    expect(s.distanceM).toBeCloseTo(10_000, 0);
    expect(s.fsplDb).toBeCloseTo(110.57, 2); // ITU-R P.525: 806 MHz, 10 km → 110.57 dB
    expect(s.elevationDeg).toBeCloseTo(0.1955, 3); // spherical geometry, calculated: 8 m → 48 m at 10 km, k = 4/3 → 0.1955°
    expect(s.earthBulgeMidM).toBeCloseTo(5.89 / 4, 1); // earth bulge d1·d2/(2kR), calculated: d1 = d2 = 5 km, k = 4/3 → 1.47 m
    // ITU-R P.526 §2 general form: D 10 km, d1 5 km, 0.8 GHz → 30.62 m; at 0.806 GHz scale by √(0.8/0.806)
    expect(s.fresnelRadiusMidM!).toBeCloseTo(30.62 * Math.sqrt(0.8 / 0.806), 1);
    // radio horizon (ITU-R P.1546 form, k = 4/3): 4.12·(√8 + √48)
    expect(s.radioHorizonKm).toBeCloseTo(4.12 * (Math.sqrt(8) + Math.sqrt(48)), 1);
    expect(s.terrain).toBeNull();
  });

  it('analyses a terrain profile when one is given, with ground heights at both ends', () => {
    const from = { lat: -47.2, lon: -128.5 };
    const to = getDestination(from, 4000, 90);
    const profile = [0, 1000, 2000, 3000, 4000].map((d) => ({ distanceM: d, groundM: d === 2000 ? 140 : 100 }));
    const s = summarisePath({ from, to, fromHeightM: 6, toHeightM: 30, freqMhz: 806, date: new Date('2026-06-01T00:00:00Z'), profile });
    expect(s.terrain?.classification).toBe('obstructed');
    expect(s.terrain?.worst?.distanceM).toBe(2000);
    expect(s.terrain!.diffractionLossDb).toBeGreaterThan(6); // beyond grazing incidence: J(ν) > 6.03 dB (ITU-R P.526)
    // Both ends at 100 m ground: the angle follows the antenna heights alone (flat ≈ atan(24/4000) = 0.344°)
    expect(s.elevationDeg).toBeCloseTo(0.3438 - (4000 / (2 * (4 / 3) * 6371008.8)) * (180 / Math.PI), 3);
  });

  it('leaves loss figures empty without a frequency', () => {
    const s = summarisePath({ from: { lat: 0, lon: 0 }, to: { lat: 0, lon: 0.1 }, fromHeightM: 0, toHeightM: 0, date: new Date('2026-06-01T00:00:00Z') });
    expect(s.fsplDb).toBeNull();
    expect(s.fresnelRadiusMidM).toBeNull();
  });
});
