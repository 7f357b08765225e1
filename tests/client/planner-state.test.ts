import { describe, expect, it } from 'vitest';
import { checkKitForm, chooseSelection, readMetres, readPlannerUrl, writePlannerUrl } from '../../src/lib/client/planner-state';

describe('planner state in the URL', () => {
  const state = {
    position: { lat: -47.2105, lon: -128.5203 },
    kit: { antennaId: '3', cableId: '2', cableM: '12.5', heightM: '7', operator: '1', simOperator: '2' },
    cellId: '42',
  };

  it('round-trips position, kit and selected cell', () => {
    const search = writePlannerUrl('', state);
    expect(search).toBe('?lat=-47.210500&lon=-128.520300&antenna=3&cable=2&cable_m=12.5&height_m=7&operator=1&sim=2&cell=42');
    expect(readPlannerUrl(search)).toEqual(state);
  });

  it('keeps parameters it does not own and drops the ones it replaces', () => {
    const search = writePlannerUrl('?customer=9&cell=1&lat=1&lon=2', { position: null, kit: {}, cellId: null });
    expect(search).toBe('?customer=9');
  });

  it('ignores malformed values', () => {
    expect(readPlannerUrl('?lat=95&lon=10&height_m=abc&antenna=x&cell=1;drop')).toEqual({ position: null, kit: {}, cellId: null });
    expect(readPlannerUrl('?lat=-47&lon=')).toEqual({ position: null, kit: {}, cellId: null });
  });
});

describe('kit form checks', () => {
  it('requires the mount height, and the cable length when there is a cable', () => {
    expect(checkKitForm({ heightM: '', cableM: '', cableId: '2' })).toEqual({ height_m: 'Enter the mount height', cable_m: 'Enter the cable length' });
    expect(checkKitForm({ heightM: '6', cableM: '', cableId: '' })).toEqual({});
    expect(checkKitForm({ heightM: 'six', cableM: '-3', cableId: '2' })).toEqual({
      height_m: 'Mount height must be a number of metres',
      cable_m: 'Cable length must be between 0 and 200 m',
    });
    expect(checkKitForm({ heightM: '6,5', cableM: '10', cableId: '2' })).toEqual({});
    expect(readMetres('6,5')).toBe(6.5);
  });
});

describe('selection after a new shortlist', () => {
  const items = [{ cell_id: 'a' }, { cell_id: 'b' }, { cell_id: 'c' }];

  it('selects the new #1 after a new position, even when the old pick is still listed', () => {
    expect(chooseSelection(items, 'c', { samePosition: false })).toBe('a');
  });

  it('keeps the pick when only the kit changed', () => {
    expect(chooseSelection(items, 'c', { samePosition: true })).toBe('c');
    expect(chooseSelection(items, 'z', { samePosition: true })).toBe('a');
  });

  it('selects the cell a shared link asks for', () => {
    expect(chooseSelection(items, null, { samePosition: false, wanted: 'b' })).toBe('b');
    expect(chooseSelection([], null, { samePosition: false })).toBeNull();
  });
});
