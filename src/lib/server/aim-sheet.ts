// Everything the aim sheet prints for one plan, recomputed now from the plan's cell and kit.
import { getDb } from './db';
import { findPlan, type Plan } from './repos/plans';
import { findCustomer, type Customer } from './repos/customers';
import { evaluatePlanKit } from './plan-service';
import { getElevationProfile } from './elevation-service';
import type { ShortlistEntry } from '../domain/shortlist';

export interface AimSheet {
  plan: Plan;
  customer: Customer;
  entry: ShortlistEntry | null;
  date: Date;
}

export async function getAimSheet(planId: string, date: Date): Promise<AimSheet> {
  const db = getDb();
  const plan = await findPlan(db, planId);
  const customer = await findCustomer(db, plan.customerId);
  // The same inputs as the plan's saved figures.
  const entry = await evaluatePlanKit(db, customer, plan, date, getElevationProfile);
  return { plan, customer, entry, date };
}
