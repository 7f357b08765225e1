import { describe, expect, it } from 'vitest';
import { getAnonymisedFigures, getCoarsePosition, getScrubbedAuditValue, PERSONAL_CUSTOMER_FIELDS, PERSONAL_PLAN_FIELDS } from '../../src/lib/domain/erasure';

// A saved shortlist row as the planner stores it in plan figures.
const FIGURES = {
  rank: 1,
  cell_id: '12',
  mast: { id: '3', name: 'Test Hill', lat: -47.2, lon: -128.5, ground_m: 210 },
  operator: { id: '1', name: 'Test Mobile A', colour: '#336699' },
  tech: 'lte',
  band: 'B20',
  channel: 6300,
  freq_mhz: 806,
  pci: 101,
  distance_m: 5234.5,
  bearing_true_deg: 81.2,
  bearing_magnetic_deg: 60.1,
  bearing_from_mast_deg: 261.2,
  elevation_deg: 1.2,
  path_loss_db: 105,
  terrain: { status: 'clear', worst_distance_m: 1200 },
  budget: [{ key: 'fspl', label: 'Free-space loss', db: -105 }],
  predicted_rsrp_dbm: -92.5,
  expected_gain_db: 8.1,
  grade: 'good',
  calibration: { readings_used: 4, residual_db: -1.5 },
  customer_position: { lat: -47.21234, lon: -128.56789 },
};

describe('anonymised plan figures', () => {
  it('keep the cell, operator and radio figures', () => {
    const kept = getAnonymisedFigures(FIGURES);
    expect(kept).toMatchObject({ cell_id: '12', tech: 'lte', band: 'B20', pci: 101, predicted_rsrp_dbm: -92.5, expected_gain_db: 8.1, grade: 'good' });
    expect(kept.mast).toEqual({ id: '3', name: 'Test Hill' });
  });

  it.each([
    'customer_position',
    'distance_m',
    'bearing_true_deg',
    'bearing_magnetic_deg',
    'bearing_from_mast_deg',
    'elevation_deg',
    'path_loss_db',
    'terrain',
    'budget',
  ])('drop %s (with the mast position it locates the home)', (key) => {
    expect(getAnonymisedFigures(FIGURES)).not.toHaveProperty(key);
  });

  it('keep nothing of an empty enquiry', () => {
    expect(getAnonymisedFigures({})).toEqual({});
  });
});

describe('coarse position', () => {
  it.each([
    [
      { lat: -47.21234, lon: -128.56789 },
      { lat: -47.2, lon: -128.6 },
    ],
    [
      { lat: 51.4778, lon: -0.0014 },
      { lat: 51.5, lon: -0 },
    ],
  ])('rounds %o to one decimal (about 11 km, common practice)', (at, expected) => {
    const got = getCoarsePosition(at);
    expect(got.lat).toBeCloseTo(expected.lat, 9);
    expect(got.lon).toBeCloseTo(expected.lon, 9);
  });
});

describe('scrubbed audit values', () => {
  it('null the personal fields of a customer entry and keep the rest', () => {
    const before = {
      name: 'Hester Quillan',
      phone: '+00 1',
      email: 'h@example.test',
      address_label: 'Alder Farm',
      postcode: 'KV3',
      lat: -47.2,
      lon: -128.5,
      notes: 'dog',
      current_antenna_id: '4',
    };
    const scrubbed = getScrubbedAuditValue(before, PERSONAL_CUSTOMER_FIELDS) as Record<string, unknown>;
    for (const f of PERSONAL_CUSTOMER_FIELDS) expect(scrubbed[f]).toBeNull();
    expect(scrubbed.current_antenna_id).toBe('4');
    expect(JSON.stringify(scrubbed)).not.toMatch(/Hester|Alder|dog/);
  });

  it('anonymise figures and clear notes inside a plan entry', () => {
    const scrubbed = getScrubbedAuditValue({ state: 'planned', notes: 'call Hester first', figures: FIGURES }, PERSONAL_PLAN_FIELDS) as Record<string, unknown>;
    expect(scrubbed.state).toBe('planned');
    expect(scrubbed.notes).toBeNull();
    expect(scrubbed.figures).toEqual(getAnonymisedFigures(FIGURES));
  });
});
