// Everything the aim sheet prints for one plan, recomputed now from the plan's cell and kit.
import { getDb } from './db';
import { findPlan, type Plan } from './repos/plans';
import { findCustomer, type Customer } from './repos/customers';
import { evaluatePlannedCell } from './shortlist-service';
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
  // The same inputs as the plan's saved figures (plan-service.ts): no defaults fill a missing kit.
  const entry =
    plan.cellId && plan.antennaId && plan.mountHeightM !== null
      ? await evaluatePlannedCell(
          db,
          plan.cellId,
          {
            at: { lat: customer.lat, lon: customer.lon },
            heightM: plan.mountHeightM,
            antennaId: plan.antennaId,
            cableId: plan.cableId ?? undefined,
            cableM: plan.cableId ? (plan.cableM ?? 0) : 0,
            currentAntennaId: customer.currentAntennaId ?? undefined,
            date,
          },
          getElevationProfile,
        )
      : null;
  return { plan, customer, entry, date };
}
