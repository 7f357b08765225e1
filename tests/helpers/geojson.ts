// GeoJSON test shapes written one position a value pair, lon before lat (RFC 7946 §3.1.1).

export type Position = [number, number];

/** A Polygon of one ring, the positions as given (close it yourself; an open ring is a test case). */
export const polygon = (...ring: Position[]) => ({ type: 'Polygon' as const, coordinates: [ring] });

/** A MultiPolygon of one polygon of one ring. */
export const multiPolygon = (...ring: Position[]) => ({ type: 'MultiPolygon' as const, coordinates: [[ring]] });

/** A closed square ring counter-clockwise from its south-west corner (RFC 7946 §3.1.6). */
export const square = (west: number, south: number, size: number) =>
  polygon([west, south], [west + size, south], [west + size, south + size], [west, south + size], [west, south]);

/** The 0.1° square lon −128.6…−128.5, lat −47.3…−47.2 in open sea near the demo island, counter-clockwise. */
export const SEA_SQUARE = polygon([-128.6, -47.3], [-128.5, -47.3], [-128.5, -47.2], [-128.6, -47.2], [-128.6, -47.3]);
