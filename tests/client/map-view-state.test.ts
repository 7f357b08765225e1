import { describe, expect, it } from 'vitest';
import { WORLD_VIEW, boundsOf, chooseInitialView, parseSavedView } from '../../src/lib/client/map-view-state';

const north = { id: '1', bbox: [-129, -47, -128, -46] as [number, number, number, number] };
const south = { id: '2', bbox: [-128.5, -48, -127.5, -47.5] as [number, number, number, number] };
const saved = { longitude: -128.2, latitude: -47.1, zoom: 11 };

describe('where the map opens', () => {
  it('fits a region asked for in the address before anything else', () => {
    expect(chooseInitialView([north, south], '2', saved)).toEqual({ bounds: [-128.5, -48, -127.5, -47.5] });
  });

  it('uses the saved view when no region is asked for, or the asked one is unknown', () => {
    expect(chooseInitialView([north, south], null, saved)).toEqual(saved);
    expect(chooseInitialView([north, south], '99', saved)).toEqual(saved);
  });

  it('fits all regions without a saved view, else shows the world', () => {
    expect(chooseInitialView([north, south], null, null)).toEqual({ bounds: [-129, -48, -127.5, -46] });
    expect(chooseInitialView([], null, null)).toBe(WORLD_VIEW);
  });

  it('joins boxes into the smallest box holding them', () => {
    expect(boundsOf([])).toBeNull();
    expect(boundsOf([north])).toEqual(north.bbox);
  });
});

describe('saved view', () => {
  it('reads a well-formed view and ignores anything else', () => {
    expect(parseSavedView(JSON.stringify(saved))).toEqual(saved);
    expect(parseSavedView(JSON.stringify({ ...saved, extra: 1 }))).toEqual(saved);
    expect(parseSavedView(null)).toBeNull();
    expect(parseSavedView('{"longitude":1,"latitude":2}')).toBeNull();
    expect(parseSavedView('{"longitude":"1","latitude":2,"zoom":3}')).toBeNull();
    expect(parseSavedView('not json')).toBeNull();
  });
});
