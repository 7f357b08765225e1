import { describe, expect, it } from 'vitest';
import {
  HEX_LEVELS,
  SIGNAL_MIN_READINGS,
  fromWebMercator,
  getHexCell,
  getHexCentre,
  getHexLevel,
  getHexLevelForZoom,
  getHexRangeForBox,
  getHexWidthOnGroundM,
  getSignalClass,
  getSignalClasses,
  getTileBox,
  toWebMercator,
} from '../../src/lib/domain/signal-map';

describe('hexagon levels', () => {
  it('follow the zoom: 32 km hexagons for a nation, 125 m for streets, two zooms per level', () => {
    expect([0, 5, 6, 7, 8, 9, 10, 11, 12, 13, 18].map((z) => getHexLevelForZoom(z).sizeM)).toEqual([
      32_000, 32_000, 8_000, 8_000, 2_000, 2_000, 500, 500, 125, 125, 125,
    ]);
    for (let k = 1; k < HEX_LEVELS.length; k++) {
      expect(HEX_LEVELS[k - 1]!.sizeM / HEX_LEVELS[k]!.sizeM).toBe(4);
      expect(HEX_LEVELS[k]!.fromZoom - HEX_LEVELS[k - 1]!.fromZoom).toBe(k === 1 ? 6 : 2);
    }
    expect(() => getHexLevel(5)).toThrow(RangeError);
    expect(SIGNAL_MIN_READINGS).toBe(5);
  });

  it('start each level at 13 px wide on its 512 px tiles (Web Mercator: 40 075 016.7 m / (512 · 2^z) per px)', () => {
    const widthPx = (sizeM: number, z: number) => (2 * sizeM) / (40_075_016.686 / (512 * 2 ** z));
    for (const level of HEX_LEVELS.slice(1)) expect(widthPx(level.sizeM, level.fromZoom)).toBeCloseTo(13.1, 1);
    // The coarsest at zoom 5, a nation's view: 26 px.
    expect(widthPx(32_000, 5)).toBeCloseTo(26.2, 1);
  });

  it('are narrower on the ground away from the equator: √3 · 125 m · cos 60° = 108.3 m [CALC]', () => {
    expect(getHexWidthOnGroundM(getHexLevel(4), 60)).toBeCloseTo(108.25, 2);
    expect(getHexWidthOnGroundM(getHexLevel(4), 0)).toBeCloseTo(216.51, 2);
  });
});

describe('Web Mercator (EPSG:3857, sphere of 6 378 137 m)', () => {
  it('maps lon 180° to π·R and back', () => {
    expect(toWebMercator(180, 0).x).toBeCloseTo(20_037_508.34, 2);
    // EPSG:3857 northing of 45° N: R · ln(tan(67.5°)) = 5 621 521.49 m [CALC].
    expect(toWebMercator(0, 45).y).toBeCloseTo(5_621_521.49, 1);
    const back = fromWebMercator(toWebMercator(-128.5, -47.2).x, toWebMercator(-128.5, -47.2).y);
    expect(back.lon).toBeCloseTo(-128.5, 10);
    expect(back.lat).toBeCloseTo(-47.2, 10);
  });

  it('gives tile 1/1/0 as the north-east quarter of the square world (OGC WebMercatorQuad, common practice)', () => {
    const b = getTileBox(1, 1, 0);
    expect(b.xmin).toBeCloseTo(0, 6);
    expect(b.ymin).toBeCloseTo(0, 6);
    expect(b.xmax).toBeCloseTo(20_037_508.34, 2);
    expect(b.ymax).toBeCloseTo(20_037_508.34, 2);
  });
});

describe('hexagon grid (PostGIS ST_Hexagon layout)', () => {
  it('puts centres 1.5 edges apart in columns, odd columns half a row up', () => {
    expect(getHexCentre(1, 0, 0)).toEqual({ x: 0, y: 0 });
    expect(getHexCentre(1, 1, 0).y).toBeCloseTo(Math.sqrt(3) / 2, 12);
    expect(getHexCentre(1, -1, -1).y).toBeCloseTo(-Math.sqrt(3) / 2, 12);
    expect(getHexCentre(2, 3, -2).x).toBe(9);
  });

  it('finds the hexagon of each centre and of points just inside its corners and flat sides', () => {
    for (const [i, j] of [
      [0, 0],
      [1, 0],
      [-1, 0],
      [-3, 5],
      [4, -7],
    ] as const) {
      const c = getHexCentre(10, i, j);
      expect(getHexCell(10, c.x, c.y)).toEqual({ i, j });
      // 0.99 of the way to each corner (±size in x, ±size/2 with ±√3/2·size), and to each flat side.
      for (const [dx, dy] of [
        [9.9, 0],
        [-9.9, 0],
        [4.95, 8.57],
        [-4.95, -8.57],
        [0, 8.57],
        [0, -8.57],
      ])
        expect(getHexCell(10, c.x + dx, c.y + dy), `${i},${j} +${dx},${dy}`).toEqual({ i, j });
    }
  });

  it('covers a box with a column and row range holding every hexagon that touches it', () => {
    const box = { xmin: -1234, ymin: 567, xmax: 2345, ymax: 3456 };
    const range = getHexRangeForBox(100, box);
    for (let x = box.xmin; x <= box.xmax; x += 37) {
      for (let y = box.ymin; y <= box.ymax; y += 41) {
        const { i, j } = getHexCell(100, x, y);
        expect(i).toBeGreaterThanOrEqual(range.iMin);
        expect(i).toBeLessThanOrEqual(range.iMax);
        expect(j).toBeGreaterThanOrEqual(range.jMin);
        expect(j).toBeLessThanOrEqual(range.jMax);
      }
    }
  });
});

describe('legend classes (installers’ quality grades, common practice)', () => {
  it('label RSRP in five grades with their dBm ranges, best first', () => {
    expect(getSignalClasses('rsrp').map((c) => [c.grade, c.range])).toEqual([
      ['excellent', '≥ −80 dBm'],
      ['good', '−90 … −80 dBm'],
      ['fair', '−100 … −90 dBm'],
      ['poor', '−110 … −100 dBm'],
      ['unusable', '< −110 dBm'],
    ]);
  });

  it('label RSRQ and SINR in four grades with their dB ranges', () => {
    expect(getSignalClasses('rsrq').map((c) => c.range)).toEqual(['≥ −10 dB', '−15 … −10 dB', '−20 … −15 dB', '< −20 dB']);
    expect(getSignalClasses('sinr').map((c) => [c.grade, c.range])).toEqual([
      ['excellent', '≥ 20 dB'],
      ['good', '13 … 20 dB'],
      ['fair', '0 … 13 dB'],
      ['poor', '< 0 dB'],
    ]);
  });

  it('put boundaries in the better grade: −85 good, −100 fair, −110.5 unusable; RSRQ −12 good; SINR 25 excellent, −2 poor', () => {
    expect(getSignalClass('rsrp', -85)).toBe('good');
    expect(getSignalClass('rsrp', -100)).toBe('fair');
    expect(getSignalClass('rsrp', -110.5)).toBe('unusable');
    expect(getSignalClass('rsrq', -12)).toBe('good');
    expect(getSignalClass('sinr', 25)).toBe('excellent');
    expect(getSignalClass('sinr', -2)).toBe('poor');
  });
});
