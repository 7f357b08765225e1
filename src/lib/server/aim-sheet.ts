// Everything the aim sheet prints for one plan, recomputed now from the plan's cell and kit.
import { getDb } from './db';
import { findPlan, type Plan } from './repos/plans';
import { findCustomer, type Customer } from './repos/customers';
import { evaluatePlannedCell } from './shortlist-service';
import { getElevationProfile } from './elevation-service';
import type { ShortlistEntry } from '../domain/shortlist';

/** Mount height when the plan does not record one — common practice, no source. */
export const DEFAULT_MOUNT_HEIGHT_M = 6;

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
  const entry = plan.cellId
    ? await evaluatePlannedCell(
        db,
        plan.cellId,
        {
          at: { lat: customer.lat, lon: customer.lon },
          heightM: plan.mountHeightM ?? DEFAULT_MOUNT_HEIGHT_M,
          antennaId: plan.antennaId ?? undefined,
          cableId: plan.cableId ?? undefined,
          cableM: plan.cableM ?? 0,
          currentAntennaId: customer.currentAntennaId ?? undefined,
          date,
        },
        getElevationProfile,
      )
    : null;
  return { plan, customer, entry, date };
}
