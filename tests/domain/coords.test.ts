import { describe, it, expect } from 'vitest';
import { CoordinateParseError, CoordinateRangeError, formatDecimal, formatDms, parseCoordinates, tryParseCoordinates } from '../../src/lib/domain/coords';

const dms = (d: number, m: number, s: number) => d + m / 60 + s / 3600;

describe('parseCoordinates', () => {
  // common practice: the ways people type or paste positions (the DMS cases use 52.2053, 0.1218)
  it.each([
    ['52.1, -1.2', 52.1, -1.2],
    ['52.1 -1.2', 52.1, -1.2],
    ['52.1;-1.2', 52.1, -1.2],
    ['  -35.2809,149.13  ', -35.2809, 149.13],
    ['+52.1 +1.2', 52.1, 1.2],
    ['geo:52.1,-1.2', 52.1, -1.2],
    ['52.1N 1.2W', 52.1, -1.2],
    ['52.1n, 1.2w', 52.1, -1.2],
    ['N52.1 W1.2', 52.1, -1.2],
    ['52.1° N, 1.2° W', 52.1, -1.2],
    ['35.28S, 149.13E', -35.28, 149.13],
    ['1.2W 52.1N', 52.1, -1.2],
    ['149.13E, 35.28S', -35.28, 149.13],
    [`52°12'19.1"N 0°7'18.5"E`, dms(52, 12, 19.1), dms(0, 7, 18.5)],
    ['52 12 19.1 N, 0 7 18.5 E', dms(52, 12, 19.1), dms(0, 7, 18.5)],
    ['52°12′19.1″N 0°07′18.5″E', dms(52, 12, 19.1), dms(0, 7, 18.5)],
    [`52º12'19.1''N 0º7'18.5''E`, dms(52, 12, 19.1), dms(0, 7, 18.5)],
    ['N 52 12 19.1 E 0 7 18.5', dms(52, 12, 19.1), dms(0, 7, 18.5)],
    [`52°12.318'N 0°7.308'E`, dms(52, 12.318, 0), dms(0, 7.308, 0)],
    [`52°12'19.1" 0°7'18.5"`, dms(52, 12, 19.1), dms(0, 7, 18.5)],
    ['52 12 19.1 0 7 18.5', dms(52, 12, 19.1), dms(0, 7, 18.5)],
    ['52 12.318 -0 7.308', dms(52, 12.318, 0), -dms(0, 7.308, 0)],
    ['52 12 19.1, -0 7 18.5', dms(52, 12, 19.1), -dms(0, 7, 18.5)],
    [`35°16'50"S 149°7'48"E`, -dms(35, 16, 50), dms(149, 7, 48)],
    ['−35.2809, 149.13', -35.2809, 149.13],
    ['90, 180', 90, 180],
  ])('reads %s', (input, lat, lon) => {
    const point = parseCoordinates(input);
    expect(point.lat).toBeCloseTo(lat, 9);
    expect(point.lon).toBeCloseTo(lon, 9);
  });

  it.each([
    ['', /Enter a latitude/],
    ['   ', /Enter a latitude/],
    ['hello', /Unexpected 'H'/],
    ['52.1', /where the latitude ends/],
    ['52.1, -1.2, 3', /exactly two/],
    ['52 12 1.2', /where the latitude ends/],
    ['95, 0', /Latitude 95 is outside/],
    ['52, 190', /Longitude 190 is outside/],
    [`52°65'N 0°E`, /Minutes must be below 60/],
    [`52°12'75"N 0°E`, /Seconds must be below 60/],
    [`52.5°12'N 1E`, /Only the last/],
    ['52N 10N', /Both coordinates are latitudes/],
    ['1E, 2W', /Both coordinates are longitudes/],
    ['-52S, 1E', /either a minus sign or a hemisphere/],
    [`52'12°N 1E`, /degrees, then minutes/],
    ['52 -12 1, 0 1 2', /Only the degrees/],
    ['52 N S, 1E', /one hemisphere letter/],
    ['52.1 @ 1.2', /Unexpected '@'/],
  ])('rejects %j', (input, message) => {
    expect(() => parseCoordinates(input)).toThrow(CoordinateParseError);
    expect(() => parseCoordinates(input)).toThrow(message);
  });

  it.each([
    ['-47,21 -128,52', -47.21, -128.52],
    ['-47,21; -128,52', -47.21, -128.52],
    ['47,5N 128,25W', 47.5, -128.25],
  ])('reads decimal commas in %j', (input, lat, lon) => {
    expect(parseCoordinates(input)).toEqual({ lat, lon });
  });

  it('keeps a lone comma as the separator of whole degrees', () => {
    expect(parseCoordinates('52,1')).toEqual({ lat: 52, lon: 1 });
  });

  it.each([
    ['95, 10', /Latitude 95 is outside −90 … 90/],
    ['10, 200', /Longitude 200 is outside −180 … 180/],
  ])('tells an out-of-range position %j apart from text that is not coordinates', (input, message) => {
    expect(() => parseCoordinates(input)).toThrow(CoordinateRangeError);
    expect(() => parseCoordinates(input)).toThrow(message);
    expect(() => parseCoordinates('Mill Farm')).not.toThrow(CoordinateRangeError);
  });

  it('returns null from tryParseCoordinates for bad input', () => {
    expect(tryParseCoordinates('nonsense')).toBeNull();
    expect(tryParseCoordinates('52.1, -1.2')).toEqual({ lat: 52.1, lon: -1.2 });
  });
});

describe('formatting', () => {
  // arithmetic: 52.2053, 0.1218 is 52°12'19.1"N 0°7'18.5"E
  it.each([
    [{ lat: 52.2053, lon: 0.1218 }, `52°12'19.1"N 0°7'18.5"E`],
    [{ lat: -35.2809, lon: 149.13 }, `35°16'51.2"S 149°7'48.0"E`],
    [{ lat: 0, lon: -0.5 }, `0°0'0.0"N 0°30'0.0"W`],
    [{ lat: 52.999999, lon: -179.99999 }, `53°0'0.0"N 180°0'0.0"W`],
  ])('formats %j as %s', (point, text) => {
    expect(formatDms(point)).toBe(text);
  });

  it('formats decimal degrees with fixed decimals', () => {
    expect(formatDecimal({ lat: 52.2053, lon: 0.1218 })).toBe('52.205300, 0.121800');
    expect(formatDecimal({ lat: -35.2809, lon: 149.13 }, 3)).toBe('-35.281, 149.130');
  });

  // Round trips: a formatted position parses back within its printed precision
  it.each([
    { lat: 52.2053, lon: 0.1218 },
    { lat: -43.53, lon: 172.63 },
    { lat: 64.8, lon: -179.8 },
    { lat: -0.000001, lon: 0.000001 },
  ])('round-trips %j through both formats', (point) => {
    const fromDms = parseCoordinates(formatDms(point));
    expect(Math.abs(fromDms.lat - point.lat)).toBeLessThanOrEqual(0.05 / 3600 + 1e-12);
    expect(Math.abs(fromDms.lon - point.lon)).toBeLessThanOrEqual(0.05 / 3600 + 1e-12);
    const fromDecimal = parseCoordinates(formatDecimal(point));
    expect(fromDecimal.lat).toBeCloseTo(point.lat, 6);
    expect(fromDecimal.lon).toBeCloseTo(point.lon, 6);
  });
});
