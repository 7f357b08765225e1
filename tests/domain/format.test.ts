import { describe, expect, it } from 'vitest';
import {
  MISSING,
  formatArea,
  formatBearing,
  formatBytes,
  formatCount,
  formatDate,
  formatDateTime,
  formatDayWithWeekday,
  formatDb,
  formatDbi,
  formatDbm,
  formatDegrees,
  formatDistance,
  formatLatLon,
  formatMbps,
  formatMetres,
  formatMhz,
  formatNumber,
  formatPercent,
  formatQuantity,
  formatSigned,
  formatTilt,
} from '../../src/lib/domain/format';

// Precision choices are common practice for field RF work (0.1° on a compass or inclinometer,
// 0.1 dB on link figures, whole dBm as meters report RSRP: 3GPP TS 36.133 §9.1.4, 1 dB steps).

describe('numbers', () => {
  it.each([
    [1.25, 1, '1.3'],
    [-0.04, 1, '0.0'],
    [-0.4, 0, '0'],
    [-2.5, 1, '-2.5'],
    [1234.5, 0, '1235'],
  ])('formatNumber(%s, %s) is %s', (v, d, out) => expect(formatNumber(v, d)).toBe(out));

  it('signs gains and leaves zero unsigned', () => {
    expect(formatSigned(3.21)).toBe('+3.2');
    expect(formatSigned(-1)).toBe('-1.0');
    expect(formatSigned(0.02)).toBe('0.0');
    expect(formatSigned(-0.02)).toBe('0.0');
  });

  it('groups thousands and counts things', () => {
    expect(formatCount(1234567)).toBe('1,234,567');
    expect(formatCount(999)).toBe('999');
    expect(formatCount(-12000)).toBe('-12,000');
    expect(formatQuantity(1, 'reading')).toBe('1 reading');
    expect(formatQuantity(2500, 'reading')).toBe('2,500 readings');
  });

  it.each([null, undefined, Number.NaN, Number.POSITIVE_INFINITY])('prints %s as missing everywhere', (v) => {
    for (const f of [
      formatNumber,
      formatSigned,
      formatCount,
      formatDbm,
      formatDb,
      formatDbi,
      formatMhz,
      formatMbps,
      formatDegrees,
      formatBearing,
      formatTilt,
      formatDistance,
      formatMetres,
      formatArea,
      formatPercent,
      formatBytes,
    ]) {
      expect(f(v as number)).toBe(MISSING);
    }
    expect(formatLatLon(v as number, 1)).toBe(MISSING);
  });
});

describe('radio figures', () => {
  it('writes RSRP in whole dBm, or 0.1 dBm when asked', () => {
    expect(formatDbm(-97.4)).toBe('-97 dBm');
    expect(formatDbm(-97.45, 1)).toBe('-97.5 dBm');
  });

  it('writes dB to 0.1, signed for gains', () => {
    expect(formatDb(7.46)).toBe('7.5 dB');
    expect(formatDb(3.2, { signed: true })).toBe('+3.2 dB');
    expect(formatDb(-0.04, { signed: true })).toBe('0.0 dB');
    expect(formatDbi(11)).toBe('11.0 dBi');
  });

  it('writes frequencies to 0.1 MHz unless the raster needs more', () => {
    expect(formatMhz(1842.5)).toBe('1842.5 MHz');
    expect(formatMhz(796)).toBe('796.0 MHz');
    // NR global raster steps of 15 kHz (3GPP TS 38.104 §5.4.2.1) fall between tenths.
    expect(formatMhz(3500.01)).toBe('3500.01 MHz');
    expect(formatMhz(3600.015)).toBe('3600.015 MHz');
    expect(formatMhz(1815, { unit: false })).toBe('1815.0');
  });

  it('writes throughput in whole Mbit/s from 10 up', () => {
    expect(formatMbps(34.6)).toBe('35 Mbit/s');
    expect(formatMbps(4.26)).toBe('4.3 Mbit/s');
  });
});

describe('angles', () => {
  it('writes bearings 0–360° to 0.1°', () => {
    expect(formatBearing(123.44)).toBe('123.4°');
    expect(formatBearing(123.45, 'true')).toBe('123.5° true');
    expect(formatBearing(-10, 'magnetic')).toBe('350.0° magnetic');
    expect(formatBearing(359.96)).toBe('0.0°');
    expect(formatBearing(720.25)).toBe('0.3°');
  });

  it('writes tilt to 0.1° with its direction', () => {
    expect(formatTilt(2.44)).toBe('2.4° up');
    expect(formatTilt(-0.75)).toBe('0.8° down');
    expect(formatTilt(-0.04)).toBe('0.0°');
    expect(formatDegrees(12.345)).toBe('12.3°');
    expect(formatDegrees(-0.3, 0)).toBe('0°');
  });
});

describe('lengths and places', () => {
  it.each([
    [4.24, '4.2 m'],
    [9.96, '10 m'],
    [850.4, '850 m'],
    [999.4, '999 m'],
    [999.6, '1.00 km'],
    [2345, '2.35 km'],
    [9994, '9.99 km'],
    [9996, '10.0 km'],
    [12345, '12.3 km'],
  ])('a distance of %s m is %s', (m, out) => expect(formatDistance(m)).toBe(out));

  it('writes kit lengths, areas, positions, percentages and sizes', () => {
    expect(formatMetres(6.5)).toBe('6.5 m');
    expect(formatMetres(25, 0)).toBe('25 m');
    expect(formatArea(12.34)).toBe('12.3 km²');
    expect(formatLatLon(-47.212347, -128.523456)).toBe('-47.21235, -128.52346');
    expect(formatLatLon(-47.2, 3, 2)).toBe('-47.20, 3.00');
    expect(formatPercent(0.6)).toBe('60 %');
    expect(formatPercent(0.00042, 2)).toBe('0.04 %');
    expect(formatBytes(512)).toBe('512 B');
    expect(formatBytes(34 * 1024 + 100)).toBe('34 kB');
    expect(formatBytes(12.5 * 1024 * 1024)).toBe('12.5 MB');
  });
});

describe('dates', () => {
  it('writes ISO dates and UTC times', () => {
    expect(formatDate('2026-12-02T23:30:00Z')).toBe('2026-12-02');
    expect(formatDate(new Date('2026-12-02T23:30:00-02:00'))).toBe('2026-12-03');
    expect(formatDate('2026-12-02')).toBe('2026-12-02');
    expect(formatDateTime('2026-12-02T14:05:59Z')).toBe('2026-12-02 14:05 UTC');
  });

  it('names the weekday of a visit day', () => {
    expect(formatDayWithWeekday('2026-12-02')).toBe('Wednesday 2026-12-02');
    expect(formatDayWithWeekday('2026-12-06')).toBe('Sunday 2026-12-06');
  });

  it.each([null, undefined, '', 'not a date'])('prints %s as missing', (v) => {
    expect(formatDate(v)).toBe(MISSING);
    expect(formatDateTime(v)).toBe(MISSING);
    expect(formatDayWithWeekday(v)).toBe(MISSING);
  });
});
