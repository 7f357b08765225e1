import { describe, expect, it } from 'vitest';
import { readMapUrl, writeMapUrl } from '../../src/lib/client/map-url';

describe('map state in the URL', () => {
  const state = { mastId: '12', view: { latitude: -47.21054, longitude: -128.52031, zoom: 13.5 } };

  it('round-trips the selected mast and the view', () => {
    const search = writeMapUrl('', state);
    expect(search).toBe('?mast=12&lat=-47.21054&lon=-128.52031&zoom=13.50');
    expect(readMapUrl(search)).toEqual(state);
  });

  it('rounds the view to about a metre and a hundredth of a zoom level', () => {
    expect(writeMapUrl('', { mastId: null, view: { latitude: 1.234567891, longitude: 2.000004, zoom: 9.876 } })).toBe('?lat=1.23457&lon=2.00000&zoom=9.88');
  });

  it('keeps parameters it does not own and drops the ones it replaces', () => {
    expect(writeMapUrl('?region=3&mast=9&zoom=2', { mastId: null, view: null })).toBe('?region=3');
    expect(writeMapUrl('?mast=9', { mastId: '10', view: null })).toBe('?mast=10');
  });

  it('ignores malformed values, each on its own', () => {
    expect(readMapUrl('?mast=012&lat=-47&lon=-128&zoom=10')).toEqual({ mastId: null, view: { latitude: -47, longitude: -128, zoom: 10 } });
    expect(readMapUrl('?mast=7&lat=95&lon=10&zoom=3')).toEqual({ mastId: '7', view: null });
    expect(readMapUrl('?mast=7;drop&lat=1&lon=2')).toEqual({ mastId: null, view: null });
    expect(readMapUrl('?lat=1&lon=2&zoom=25')).toEqual({ mastId: null, view: null });
    expect(readMapUrl('?lat=&lon=2&zoom=3')).toEqual({ mastId: null, view: null });
    expect(readMapUrl('?lat=0x10&lon=2&zoom=3')).toEqual({ mastId: null, view: null });
    expect(readMapUrl('')).toEqual({ mastId: null, view: null });
  });
});
