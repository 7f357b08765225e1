import { describe, expect, it } from 'vitest';
import { WEAK_BELOW_RSRP_DBM, gradePrediction, isWeakPrediction } from '../../src/lib/domain/coverage-gaps';

// Grade floors are common practice among installers (measurements.ts): RSRP ≥ −100 dBm is "fair".
describe('coverage gaps', () => {
  it.each([
    [-79.9, 'lte', false],
    [-100, 'lte', false],
    [-100.1, 'lte', true],
    [-112, 'lte', true],
    [-100, 'nr', false],
    [-105, 'nr', true],
  ])('a prediction of %s dBm (%s) is weak: %s', (rsrpDbm, tech, weak) => {
    expect(isWeakPrediction({ rsrpDbm, tech })).toBe(weak);
  });

  it('puts the weak threshold exactly at the floor of the "fair" grade', () => {
    expect(gradePrediction({ rsrpDbm: WEAK_BELOW_RSRP_DBM, tech: 'lte' })).toBe('fair');
    expect(gradePrediction({ rsrpDbm: WEAK_BELOW_RSRP_DBM - 0.01, tech: 'lte' })).toBe('poor');
    expect(gradePrediction({ rsrpDbm: -120, tech: 'lte' })).toBe('unusable');
  });
});
