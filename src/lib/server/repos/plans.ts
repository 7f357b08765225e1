// Plans (a customer's chosen cell and kit, and where the job stands) and their install checks.
import type { Knex } from 'knex';
import type { Tx } from '../db';
import {
  checkTransition,
  getCheckPhaseProblem,
  getMeasuredGains,
  getMissingFacts,
  isKitLocked,
  summariseSpeedTests,
  type PlanFacts,
  type PredictedGain,
} from '../../domain/plan-state';
import {
  CHECK_READING,
  INSTALL_CHECK,
  PLAN,
  SPEED_TEST,
  hasFigures,
  type CheckPhase,
  type InstallCheck,
  type InstallCheckInput,
  type Plan,
  type PlanChange,
  type PlanDetail,
  type PlanFiguresFieldJson,
  type PlanInput,
  type PlanListQuery,
  type PlanResult,
} from '../../schemas/plans';
import { camel } from '../../schemas/record';
import { AppError, ConflictError, NotFoundError, ValidationError } from '../errors';
import { getPciProblem } from '../../domain/measurements';
import { recordAudit } from './audit';
import { recordColumns } from './record-sql';

export type { InstallCheck, Plan, PlanDetail, PlanResult };

function selectPlans(db: Tx): Knex.QueryBuilder {
  return db('plans as p')
    .join('customers as cu', 'cu.id', 'p.customer_id')
    .leftJoin('cells as ce', 'ce.id', 'p.cell_id')
    .leftJoin('masts as m', 'm.id', 'ce.mast_id')
    .leftJoin('operators as o', 'o.id', 'ce.operator_id')
    .leftJoin('antennas as a', 'a.id', 'p.antenna_id')
    .leftJoin('cables as cb', 'cb.id', 'p.cable_id')
    .leftJoin('users as u', 'u.id', 'p.created_by')
    .select(recordColumns(db, PLAN, 'p'));
}

const toPlan = (row: Record<string, unknown>): Plan => PLAN.fromRow(row);

// --- reads --------------------------------------------------------------------------------

export async function listPlans(db: Tx, query: PlanListQuery): Promise<{ items: Plan[]; total: number }> {
  const filtered = (q: Knex.QueryBuilder) => {
    if (query.customer_id) q.where('p.customer_id', query.customer_id);
    if (query.state) q.where('p.state', query.state);
    return q;
  };
  const [{ count }] = await filtered(db('plans as p')).count<{ count: string }[]>('* as count');
  const rows = await filtered(selectPlans(db))
    .orderBy([
      { column: 'p.updated_at', order: 'desc' },
      { column: 'p.id', order: 'desc' },
    ])
    .limit(query.limit)
    .offset(query.offset);
  return { items: rows.map(toPlan), total: Number(count) };
}

export async function findPlan(db: Tx, id: string): Promise<Plan> {
  const row = await selectPlans(db).where('p.id', id).first();
  if (!row) throw new NotFoundError('Plan not found');
  return toPlan(row);
}

export async function listInstallChecks(db: Tx, planId: string): Promise<InstallCheck[]> {
  const rows = await db('install_checks as c')
    .leftJoin('users as u', 'u.id', 'c.created_by')
    .where('c.plan_id', planId)
    .orderBy([{ column: 'c.taken_at' }, { column: 'c.id' }])
    .select(recordColumns(db, INSTALL_CHECK, 'c'));
  return rows.map((r) => INSTALL_CHECK.fromRow(r));
}

const finite = (v: unknown): number | null => (typeof v === 'number' && Number.isFinite(v) ? v : null);

/**
 * Measured against predicted: the latest before and after checks, per cell. The prediction is
 * the plan's figures snapshot (expected_gain_db, predicted_rsrp_dbm from the shortlist) for
 * the plan's cell.
 */
export function getPlanResult(plan: Plan, checks: readonly InstallCheck[]): PlanResult {
  const latest = (phase: CheckPhase) => [...checks].reverse().find((c) => c.phase === phase) ?? null;
  const before = latest('before');
  const after = latest('after');
  const figures = hasFigures(plan.figures) ? plan.figures : null;
  const expected = finite(figures?.expected_gain_db);
  const pci = plan.cell?.pci ?? finite(figures?.pci);
  const channel = plan.cell?.channel ?? finite(figures?.channel);
  const predicted: PredictedGain[] = expected !== null && pci !== null ? [{ pci, channel, gainDb: expected }] : [];
  return {
    beforeCheckId: before?.id ?? null,
    afterCheckId: after?.id ?? null,
    predictedRsrpDbm: finite(figures?.predicted_rsrp_dbm),
    expectedThroughputMbps: finite(figures?.expected_throughput_mbps),
    gains: getMeasuredGains(before?.readings ?? [], after?.readings ?? [], predicted),
    speedBefore: summariseSpeedTests(before?.speedTests ?? []),
    speedAfter: summariseSpeedTests(after?.speedTests ?? []),
  };
}

export async function findPlanDetail(db: Tx, id: string): Promise<PlanDetail> {
  const plan = await findPlan(db, id);
  const checks = await listInstallChecks(db, id);
  return { ...plan, checks, result: getPlanResult(plan, checks) };
}

// --- writes -------------------------------------------------------------------------------

async function assertReferences(db: Tx, refs: { customerId?: string; cellId?: string | null; antennaId?: string | null; cableId?: string | null }) {
  const fields: Record<string, string[]> = {};
  const missing = async (table: string, id: string | null | undefined) => !!id && !(await db(table).where({ id }).first('id'));
  if (await missing('customers', refs.customerId)) fields.customer_id = ['No such customer'];
  if (await missing('cells', refs.cellId)) fields.cell_id = ['No such cell'];
  if (await missing('antennas', refs.antennaId)) fields.antenna_id = ['No such antenna in the catalogue'];
  if (await missing('cables', refs.cableId)) fields.cable_id = ['No such cable in the catalogue'];
  if (Object.keys(fields).length) throw new ValidationError('Some fields need attention', fields);
}

const auditView = (p: Plan) => PLAN.auditView(p);

async function countAfterChecks(db: Tx, planId: string): Promise<number> {
  const row = await db('install_checks').where({ plan_id: planId, phase: 'after' }).count<{ count: string }[]>('* as count').first();
  return Number(row?.count ?? 0);
}

const incomplete = (message: string, fields: Record<string, string[]>) => new AppError('UNPROCESSABLE_CONTENT', message, fields);

/** A plan to insert: the parsed input for an existing customer, with the figures the server computed. */
export type NewPlan = Omit<PlanInput, 'customerId' | 'newCustomer'> & { customerId: string; figures: PlanFiguresFieldJson };

export async function createPlan(db: Tx, input: NewPlan, actorId: string): Promise<Plan> {
  await assertReferences(db, input);
  const missing = getMissingFacts(input.state, { ...input, afterCheckCount: 0 });
  if (Object.keys(missing).length) throw incomplete(`The plan is not ready to be ${input.state}`, missing);
  const [row] = await db('plans')
    .insert({ ...PLAN.insertRow(input), created_by: actorId, updated_by: actorId })
    .returning('id');
  await db('customers').where({ id: input.customerId }).update({ updated_at: db.fn.now() });
  const plan = await findPlan(db, String(row.id));
  await recordAudit(db, { userId: actorId, action: 'create', entity: 'plan', entityId: plan.id, after: auditView(plan) });
  return plan;
}

// Figures follow the kit (the server computes them), so only the kit fields themselves are named.
const KIT_FIELDS = ['cell_id', 'antenna_id', 'cable_id', 'cable_m', 'mount_height_m'] as const;

/**
 * Edits a plan and moves it between states. A forbidden step is a conflict (409); a step the
 * plan is not ready for is unprocessable (422) with the missing fields.
 */
export async function updatePlan(db: Tx, id: string, change: PlanChange & { figures?: PlanFiguresFieldJson }, actorId: string): Promise<Plan> {
  const locked = await db('plans').where({ id }).forUpdate().first('row_version');
  if (!locked) throw new NotFoundError('Plan not found');
  if (change.rowVersion !== undefined && change.rowVersion !== locked.row_version) {
    throw new ConflictError('Someone else changed this plan since you opened it; reload to see their change');
  }
  const before = await findPlan(db, id);
  const to = change.state ?? before.state;

  const kitChanges = KIT_FIELDS.filter((k) => change[camel(k)] !== undefined && JSON.stringify(change[camel(k)]) !== JSON.stringify(before[camel(k)]));
  if (kitChanges.length && isKitLocked(before.state) && isKitLocked(to)) {
    const fields = Object.fromEntries(kitChanges.map((k) => [k, ['Fixed once installed; move the plan back to scheduled to change it']]));
    throw incomplete(`The cell and kit of an ${before.state} plan are fixed`, fields);
  }
  await assertReferences(db, change);

  const facts: PlanFacts = {
    cellId: change.cellId !== undefined ? change.cellId : before.cellId,
    antennaId: change.antennaId !== undefined ? change.antennaId : before.antennaId,
    cableId: change.cableId !== undefined ? change.cableId : before.cableId,
    cableM: change.cableM !== undefined ? change.cableM : before.cableM,
    mountHeightM: change.mountHeightM !== undefined ? change.mountHeightM : before.mountHeightM,
    scheduledFor: change.scheduledFor !== undefined ? change.scheduledFor : before.scheduledFor,
    afterCheckCount: to === 'verified' ? await countAfterChecks(db, id) : 0,
  };
  const check = checkTransition(before.state, to, facts);
  if (!check.ok) {
    if (check.reason === 'forbidden') throw new ConflictError(check.message);
    throw incomplete(check.message, check.fields);
  }
  // Whatever the step, the plan may not end up lacking what its state needs (e.g. a planned
  // plan whose cell is cleared in the same request).
  const missing = getMissingFacts(to, facts);
  if (Object.keys(missing).length) throw incomplete(`A ${to} plan needs these`, missing);

  const patch: Record<string, unknown> = {
    ...PLAN.patchRow(change),
    updated_at: db.fn.now(),
    updated_by: actorId,
    row_version: db.raw('row_version + 1'),
  };
  if (change.figures !== undefined) patch.figures = JSON.stringify(change.figures);
  if (to !== before.state) {
    patch.state = to;
    patch.state_changed_at = db.fn.now();
  }
  await db('plans').where({ id }).update(patch);
  await db('customers').where({ id: before.customerId }).update({ updated_at: db.fn.now() });
  const after = await findPlan(db, id);
  await recordAudit(db, {
    userId: actorId,
    action: to !== before.state ? 'state' : 'update',
    entity: 'plan',
    entityId: id,
    before: auditView(before),
    after: auditView(after),
  });
  return after;
}

export async function addInstallCheck(db: Tx, planId: string, input: InstallCheckInput, actorId: string, now: Date): Promise<InstallCheck> {
  const locked = await db('plans').where({ id: planId }).forUpdate().first('state');
  if (!locked) throw new NotFoundError('Plan not found');
  const problem = getCheckPhaseProblem(locked.state, input.phase);
  if (problem) throw incomplete(problem, { phase: [problem] });
  // Readings are of the plan's technology: an LTE plan's PCIs are 0–503.
  const cell = await db('plans as p').join('cells as c', 'c.id', 'p.cell_id').where('p.id', planId).first('c.tech');
  if (cell) {
    const fields = Object.fromEntries(
      input.readings.flatMap((r, i) => {
        const message = getPciProblem(cell.tech, r.pci);
        return message ? [[`readings.${i}.pci`, [message]]] : [];
      }),
    );
    if (Object.keys(fields).length) throw new ValidationError('Some readings need attention', fields);
  }
  const [row] = await db('install_checks')
    .insert({ ...INSTALL_CHECK.insertRow(input), plan_id: planId, taken_at: input.takenAt ?? now, created_by: actorId })
    .returning('id');
  const checkId = String(row.id);
  if (input.readings.length) {
    await db('install_check_readings').insert(input.readings.map((r) => ({ check_id: checkId, ...CHECK_READING.insertRow(r) })));
  }
  if (input.speedTests.length) {
    await db('install_check_speed_tests').insert(input.speedTests.map((t) => ({ check_id: checkId, ...SPEED_TEST.insertRow(t) })));
  }
  await db('plans').where({ id: planId }).update({ updated_at: db.fn.now() });
  const check = (await listInstallChecks(db, planId)).find((c) => c.id === checkId)!;
  await recordAudit(db, {
    userId: actorId,
    action: 'check',
    entity: 'plan',
    entityId: planId,
    after: {
      check_id: checkId,
      phase: check.phase,
      taken_at: check.takenAt.toISOString(),
      readings: check.readings.length,
      speed_tests: check.speedTests.length,
    },
  });
  return check;
}
