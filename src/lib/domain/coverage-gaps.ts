/**
 * Coverage gaps: customers whose best prediction is weak. A customer's prediction is the RSRP a
 * planner's shortlist row predicted with the chosen kit, as kept in the plan's figures; a customer
 * with several plans counts by the strongest one. The prediction is weak when its quality grade
 * (measurements.ts, common practice among installers) is poor or unusable, i.e. below the floor
 * of "fair". Customers without any predicted plan (enquiries not yet planned) are counted apart:
 * they are not known to be gaps.
 */
import { gradeSignal, type SignalGrade } from './measurements';

export interface Prediction {
  /** Predicted RSRP with the plan's kit, dBm. */
  rsrpDbm: number;
  tech: string;
}

/** Grades that make a prediction weak. */
export const WEAK_GRADES: readonly SignalGrade[] = ['poor', 'unusable'];

/** The RSRP below which a prediction is weak: the lowest value still graded "fair". */
export const WEAK_BELOW_RSRP_DBM = -100;

export function gradePrediction(p: Prediction): SignalGrade {
  return gradeSignal(p.tech === 'nr' ? 'nrSsRsrp' : 'lteRsrp', p.rsrpDbm);
}

export function isWeakPrediction(p: Prediction): boolean {
  return WEAK_GRADES.includes(gradePrediction(p));
}

/** The rule in words, for the page that lists the gaps. */
export const COVERAGE_GAP_RULE =
  `A customer is a coverage gap when the strongest RSRP predicted for any of their plans (with the plan's antenna, cable and mount height) ` +
  `is below ${WEAK_BELOW_RSRP_DBM} dBm, graded poor or unusable. Customers whose plans have no prediction yet are counted apart.`;
