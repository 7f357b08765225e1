import { describe, expect, it } from 'vitest';
import { countVertices, getPixelToleranceDeg } from '../../src/lib/domain/region-outline';

describe('pixel tolerance', () => {
  // 256-px tiles: the world (360°) is 256 px wide at zoom 0 and doubles each zoom (common practice).
  it.each([
    [0, 360 / 256],
    [8, 360 / 65536],
    [16, 360 / 16777216],
  ])('is 360° / (256 · 2^z) at zoom %i', (zoom, deg) => {
    expect(getPixelToleranceDeg(zoom)).toBeCloseTo(deg, 15);
  });

  it('halves with each zoom step', () => {
    expect(getPixelToleranceDeg(10) / getPixelToleranceDeg(11)).toBeCloseTo(2, 12);
  });
});

describe('vertex count', () => {
  const square = [
    [0, 0],
    [1, 0],
    [1, 1],
    [0, 1],
    [0, 0],
  ];
  it('counts every ring of a polygon, closing positions included', () => {
    expect(countVertices({ type: 'Polygon', coordinates: [square, square.slice(0, 4).concat([[0, 0]])] })).toBe(10);
  });
  it('counts every polygon of a multipolygon', () => {
    expect(countVertices({ type: 'MultiPolygon', coordinates: [[square], [square], [square]] })).toBe(15);
  });
});
