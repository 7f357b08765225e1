import { describe, expect, it } from 'vitest';
import { isUnderPanel, panelOffset } from '../../src/components/map/panel-offset';
import { bandsOf, sortBands } from '../../src/components/map/map-data';

describe('keeping a mast clear of its panel', () => {
  const desk = { width: 1280, height: 800 };
  const phone = { width: 390, height: 760 };

  it('shifts left by half the side panel (28rem, 32rem from 1024 px) and up on a phone', () => {
    expect(panelOffset(desk, false, 1280)).toEqual([-256, 0]);
    expect(panelOffset({ width: 800, height: 600 }, false, 800)).toEqual([-224, 0]);
    expect(panelOffset(phone, true, 390)).toEqual([0, -220]);
    expect(panelOffset(null, false, 1280)).toEqual([0, 0]);
  });

  it('says when a clicked point would be covered', () => {
    const side = panelOffset(desk, false, 1280);
    // The side panel starts 512 px from the right edge; 24 px of margin.
    expect(isUnderPanel({ x: 740, y: 300 }, desk, false, side)).toBe(false);
    expect(isUnderPanel({ x: 760, y: 300 }, desk, false, side)).toBe(true);
    const sheet = panelOffset(phone, true, 390);
    expect(isUnderPanel({ x: 200, y: 300 }, phone, true, sheet)).toBe(false);
    expect(isUnderPanel({ x: 200, y: 310 }, phone, true, sheet)).toBe(true);
  });
});

describe('bands for the band filter', () => {
  it('collects the comma-separated bands of mast features', () => {
    expect([
      ...bandsOf([{ properties: { bands: 'B3, n78' } }, { properties: { bands: '' } }, { properties: null }, { properties: { bands: 'B3,B20' } }]),
    ]).toEqual(['B3', 'n78', 'B20']);
  });

  it('orders lettered bands by number, then NR, then bare numbers', () => {
    expect(sortBands(['n78', 'B20', '900', 'B3', 'n1', 'x'])).toEqual(['B3', 'B20', 'n1', 'n78', '900', 'x']);
  });
});
