// The mast and cell forms' text → API body, checked with the API's own schemas.
import { describe, expect, it } from 'vitest';
import { CellInputSchema, MastInputSchema, type CellJson } from '../../src/lib/schemas/masts';
import type { MastDetailJson } from '../../src/lib/schemas/mast-responses';
import { checkWith } from '../../src/lib/client/api';
import { changedMastFields, mastDraftOf, mastInputOf, newMastDraft, readNumber } from '../../src/components/map/mast-form';
import { bandChoices, bandForTech, cellDraftOf, cellInputOf, changedCellFields, describeChannel, newCellDraft } from '../../src/components/map/cell-form';

// As the API answers it (operator_id is not part of the JSON; the operator is).
const cell = {
  id: '7',
  mast_id: '3',
  operator: { id: '2', name: 'Orvane Mobile', colour: '#0072b2' },
  tech: 'lte',
  band: 'B20',
  channel: 6300,
  dl_mhz: 806,
  pci: 101,
  cell_identity: null,
  sector_azimuth_deg: 120,
  antenna_height_m: 30,
  bandwidth_mhz: 10,
  rs_power_dbm: 15.2,
  last_observed_at: null,
  row_version: 4,
  created_at: '2026-01-01T00:00:00.000Z',
  updated_at: '2026-01-01T00:00:00.000Z',
} as CellJson;

describe('numbers typed into the forms', () => {
  it.each([
    ['12.5', true, 12.5],
    ['12,5', true, 12.5],
    [' -47.2 ', false, -47.2],
    ['', true, null],
    ['', false, undefined],
    ['abc', true, 'abc'],
    ['1e3', true, '1e3'],
  ])('%j (blank allowed: %s) → %j', (text, nullable, out) => {
    expect(readNumber(text, nullable)).toBe(out);
  });
});

describe('new mast form', () => {
  it('starts at the clicked position with six decimals and passes the API schema once named', () => {
    const draft = newMastDraft(-47.2105432, -128.5203111);
    expect([draft.lat, draft.lon]).toEqual(['-47.210543', '-128.520311']);
    expect(checkWith(MastInputSchema, mastInputOf(draft))).toEqual({ name: ['Required'] });
    const body = mastInputOf({ ...draft, name: 'Kestrel Hill', structure_height_m: '25', reference: ' ' });
    expect(body).toMatchObject({ name: 'Kestrel Hill', lat: -47.210543, lon: -128.520311, structure_height_m: 25, ground_elevation_m: null, reference: null });
    expect(checkWith(MastInputSchema, body)).toBeNull();
  });

  it('names bad coordinates and non-numbers beside their fields', () => {
    const fields = checkWith(MastInputSchema, mastInputOf({ ...newMastDraft(0, 0), name: 'X', lat: '95', lon: '', structure_height_m: 'tall' }));
    expect(fields?.lat?.[0]).toMatch(/between −90 and 90/);
    expect(fields?.lon?.[0]).toMatch(/required/i);
    expect(fields?.structure_height_m?.[0]).toMatch(/must be a number/);
  });

  it('sends only what changed when editing, lat and lon together', () => {
    const mast = {
      id: '3',
      name: 'Kestrel Hill',
      reference: null,
      lat: -47.2,
      lon: -128.5,
      ground_elevation_m: 210,
      structure_height_m: null,
      structure_type: 'monopole',
      status: 'active',
      access_notes: null,
    } as MastDetailJson;
    const before = mastDraftOf(mast);
    expect(changedMastFields(before, before)).toEqual({});
    expect(changedMastFields(before, { ...before, lat: '-47.3', ground_elevation_m: '', access_notes: 'Gate' })).toEqual({
      lat: -47.3,
      lon: -128.5,
      ground_elevation_m: null,
      access_notes: 'Gate',
    });
  });
});

describe('cell form', () => {
  it('checks the channel against the band like the API (TS 36.101 Table 5.7.3-1: B20 downlink EARFCN 6150–6449)', () => {
    const draft = { ...newCellDraft('2'), channel: '6300', band: 'B20' };
    expect(checkWith(CellInputSchema, cellInputOf(draft))).toBeNull();
    expect(checkWith(CellInputSchema, cellInputOf({ ...draft, channel: '1300' }))?.channel?.[0]).toMatch(/not in band B20/);
    expect(checkWith(CellInputSchema, cellInputOf({ ...draft, pci: '504' }))?.pci?.[0]).toBe('LTE PCI must be 0–503');
    expect(checkWith(CellInputSchema, cellInputOf({ ...draft, channel: '' }))?.channel?.[0]).toBe('Channel is required');
  });

  it('derives the band from the channel when none is chosen, and says so while typing (TS 38.104 §5.4.2.1: NR-ARFCN 632628 is 3489.42 MHz)', () => {
    expect(describeChannel('lte', '6300', '')).toBe('Band B20 · 806.0 MHz down');
    expect(describeChannel('lte', '1300', 'B20')).toBeNull();
    expect(describeChannel('lte', '63.5', '')).toBeNull();
    expect(describeChannel('nr', '632628', '')).toMatch(/^Band n78 · 3489\.4 MHz down$/);
  });

  it('keeps the band across a technology change only where that technology has it', () => {
    expect(bandForTech('nr', 'B20')).toBe('');
    expect(bandForTech('lte', 'B20')).toBe('B20');
    expect(bandChoices('lte')).toContain('B20');
    expect(bandChoices('nr')).toContain('n78');
  });

  it('edits send only the changed fields, and an unchanged cell sends nothing', () => {
    const before = cellDraftOf(cell);
    expect(changedCellFields(before, before)).toEqual({});
    expect(changedCellFields(before, { ...before, pci: '102', sector_azimuth_deg: '' })).toEqual({ pci: 102, sector_azimuth_deg: null });
    expect(checkWith(CellInputSchema, cellInputOf(before))).toBeNull();
  });
});
