// Saving plans with the figures the server predicts for their cell and kit, so that what the
// planner saw, what is saved and what the aim sheet prints come from one computation.
import type { Tx } from './db';
import type { PlanChange, PlanFiguresFieldJson, PlanInput } from '../schemas/plans';
import { createCustomer, findCustomer, type Customer } from './repos/customers';
import { createPlan, findPlan, updatePlan, type Plan } from './repos/plans';
import { evaluatePlannedCell, type ProfileProvider } from './shortlist-service';
import { shortlistItemJson } from './shortlist-json';

export interface PlanKit {
  cellId: string | null;
  antennaId: string | null;
  cableId: string | null;
  cableM: number | null;
  mountHeightM: number | null;
}

/**
 * The shortlist entry of the plan's cell for the customer's position and the plan's kit; null
 * until a cell, an antenna and a mount height are chosen (no defaults fill a missing kit).
 */
export async function evaluatePlanKit(db: Tx, customer: Customer, kit: PlanKit, date: Date, profileFor: ProfileProvider) {
  if (!kit.cellId || !kit.antennaId || kit.mountHeightM === null) return null;
  return evaluatePlannedCell(
    db,
    kit.cellId,
    {
      at: { lat: customer.lat, lon: customer.lon },
      heightM: kit.mountHeightM,
      antennaId: kit.antennaId,
      cableId: kit.cableId ?? undefined,
      cableM: kit.cableId ? (kit.cableM ?? 0) : 0,
      currentAntennaId: customer.currentAntennaId ?? undefined,
      date,
    },
    profileFor,
  );
}

/** The saved form of `evaluatePlanKit`: the shortlist row with the position and kit it was computed for, or empty. */
export async function computePlanFigures(db: Tx, customerId: string, kit: PlanKit, date: Date, profileFor: ProfileProvider): Promise<PlanFiguresFieldJson> {
  if (!kit.cellId || !kit.antennaId || kit.mountHeightM === null) return {};
  const customer = await findCustomer(db, customerId);
  const entry = await evaluatePlanKit(db, customer, kit, date, profileFor);
  if (!entry) return {};
  return {
    ...shortlistItemJson(entry, 1),
    customer_position: { lat: customer.lat, lon: customer.lon },
    kit: { antenna_id: kit.antennaId, cable_id: kit.cableId, cable_m: kit.cableM, mount_height_m: kit.mountHeightM },
    computed_at: date.toISOString(),
  };
}

/** Creates the plan (and its new customer, if one is given) in the caller's transaction. */
export async function savePlan(trx: Tx, input: PlanInput, actorId: string, date: Date, profileFor: ProfileProvider): Promise<Plan> {
  const customerId = input.newCustomer ? (await createCustomer(trx, input.newCustomer, actorId)).id : input.customerId!;
  const { newCustomer: _new, ...rest } = input;
  const figures = await computePlanFigures(trx, customerId, input, date, profileFor);
  return createPlan(trx, { ...rest, customerId, figures }, actorId);
}

const KIT_KEYS = ['cellId', 'antennaId', 'cableId', 'cableM', 'mountHeightM'] as const;

/** Applies a change; a new cell or kit gets newly computed figures. */
export async function changePlan(trx: Tx, id: string, change: PlanChange, actorId: string, date: Date, profileFor: ProfileProvider): Promise<Plan> {
  if (!KIT_KEYS.some((k) => change[k] !== undefined)) return updatePlan(trx, id, change, actorId);
  const before = await findPlan(trx, id);
  const kit = Object.fromEntries(KIT_KEYS.map((k) => [k, change[k] !== undefined ? change[k] : before[k]])) as unknown as PlanKit;
  const figures = await computePlanFigures(trx, before.customerId, kit, date, profileFor);
  return updatePlan(trx, id, { ...change, figures }, actorId);
}
