// Plans (a customer's chosen cell and kit, and where the job stands) and their install checks.
import type { Knex } from 'knex';
import type { Tx } from '../db';
import {
  checkTransition,
  getAllowedTransitions,
  getCheckPhaseProblem,
  getMeasuredGains,
  getMissingFacts,
  isKitLocked,
  summariseSpeedTests,
  type CheckReading,
  type MeasuredGain,
  type PlanFacts,
  type PlanState,
  type PredictedGain,
  type SpeedSummary,
  type SpeedTest,
} from '../../domain/plan-state';
import type {
  CheckPhase,
  InstallCheckInput,
  InstallCheckJson,
  PlanChange,
  PlanDetailJson,
  PlanInput,
  PlanJson,
  PlanFiguresFieldJson,
  PlanListQuery,
  SpeedSummaryJson,
} from '../../schemas/plans';
import { hasFigures } from '../../schemas/plans';
import { AppError, ConflictError, NotFoundError, ValidationError } from '../errors';
import { getPciProblem } from '../../domain/measurements';
import { recordAudit } from './audit';

export interface PlanCell {
  id: string;
  mastId: string;
  mastName: string;
  operatorId: string;
  operatorName: string;
  tech: string;
  band: string;
  channel: number;
  dlMhz: number | null;
  pci: number | null;
  sectorAzimuthDeg: number | null;
  lat: number;
  lon: number;
}

export interface Plan {
  id: string;
  customerId: string;
  customerName: string;
  state: PlanState;
  cellId: string | null;
  cell: PlanCell | null;
  antennaId: string | null;
  antennaName: string | null;
  cableId: string | null;
  cableName: string | null;
  cableM: number | null;
  mountHeightM: number | null;
  figures: PlanFiguresFieldJson;
  scheduledFor: string | null;
  notes: string | null;
  createdBy: string | null;
  createdByName: string | null;
  createdAt: Date;
  updatedAt: Date;
  stateChangedAt: Date;
  rowVersion: number;
}

export interface InstallCheck {
  id: string;
  planId: string;
  phase: CheckPhase;
  takenAt: Date;
  notes: string | null;
  createdBy: string | null;
  createdByName: string | null;
  createdAt: Date;
  readings: CheckReading[];
  speedTests: SpeedTest[];
}

export interface PlanResult {
  beforeCheckId: string | null;
  afterCheckId: string | null;
  predictedRsrpDbm: number | null;
  expectedThroughputMbps: number | null;
  gains: MeasuredGain[];
  speedBefore: SpeedSummary;
  speedAfter: SpeedSummary;
}

export interface PlanDetail extends Plan {
  checks: InstallCheck[];
  result: PlanResult;
}

const str = (v: unknown) => (v === null || v === undefined ? null : String(v));

function selectPlans(db: Tx): Knex.QueryBuilder {
  return db('plans as p')
    .join('customers as cu', 'cu.id', 'p.customer_id')
    .leftJoin('cells as ce', 'ce.id', 'p.cell_id')
    .leftJoin('masts as m', 'm.id', 'ce.mast_id')
    .leftJoin('operators as o', 'o.id', 'ce.operator_id')
    .leftJoin('antennas as a', 'a.id', 'p.antenna_id')
    .leftJoin('cables as cb', 'cb.id', 'p.cable_id')
    .leftJoin('users as u', 'u.id', 'p.created_by')
    .select(
      'p.*',
      db.raw("to_char(p.scheduled_for, 'YYYY-MM-DD') AS scheduled_for"),
      'cu.name as customer_name',
      'a.name as antenna_name',
      'cb.name as cable_name',
      'u.name as created_by_name',
      'ce.mast_id as cell_mast_id',
      'm.name as cell_mast_name',
      'ce.operator_id as cell_operator_id',
      'o.name as cell_operator_name',
      'ce.tech as cell_tech',
      'ce.band as cell_band',
      'ce.channel as cell_channel',
      'ce.dl_mhz as cell_dl_mhz',
      'ce.pci as cell_pci',
      'ce.sector_azimuth_deg as cell_sector_azimuth_deg',
      db.raw('ST_Y(m.geom) AS cell_lat'),
      db.raw('ST_X(m.geom) AS cell_lon'),
    );
}

// eslint-disable-next-line @typescript-eslint/no-explicit-any
function toPlan(r: any): Plan {
  return {
    id: String(r.id),
    customerId: String(r.customer_id),
    customerName: r.customer_name,
    state: r.state,
    cellId: str(r.cell_id),
    cell:
      r.cell_id !== null && r.cell_mast_id !== null
        ? {
            id: String(r.cell_id),
            mastId: String(r.cell_mast_id),
            mastName: r.cell_mast_name,
            operatorId: String(r.cell_operator_id),
            operatorName: r.cell_operator_name,
            tech: r.cell_tech,
            band: r.cell_band,
            channel: r.cell_channel,
            dlMhz: r.cell_dl_mhz,
            pci: r.cell_pci,
            sectorAzimuthDeg: r.cell_sector_azimuth_deg,
            lat: r.cell_lat,
            lon: r.cell_lon,
          }
        : null,
    antennaId: str(r.antenna_id),
    antennaName: r.antenna_name,
    cableId: str(r.cable_id),
    cableName: r.cable_name,
    cableM: r.cable_m,
    mountHeightM: r.mount_height_m,
    figures: r.figures ?? {},
    scheduledFor: r.scheduled_for,
    notes: r.notes,
    createdBy: str(r.created_by),
    createdByName: r.created_by_name,
    createdAt: r.created_at,
    updatedAt: r.updated_at,
    stateChangedAt: r.state_changed_at,
    rowVersion: r.row_version,
  };
}

export function planJson(p: Plan): PlanJson {
  return {
    id: p.id,
    customer_id: p.customerId,
    customer_name: p.customerName,
    state: p.state,
    next_states: getAllowedTransitions(p.state),
    cell_id: p.cellId,
    cell: p.cell && {
      id: p.cell.id,
      mast_id: p.cell.mastId,
      mast_name: p.cell.mastName,
      operator_id: p.cell.operatorId,
      operator_name: p.cell.operatorName,
      tech: p.cell.tech,
      band: p.cell.band,
      channel: p.cell.channel,
      dl_mhz: p.cell.dlMhz,
      pci: p.cell.pci,
      sector_azimuth_deg: p.cell.sectorAzimuthDeg,
      lat: p.cell.lat,
      lon: p.cell.lon,
    },
    antenna_id: p.antennaId,
    antenna_name: p.antennaName,
    cable_id: p.cableId,
    cable_name: p.cableName,
    cable_m: p.cableM,
    mount_height_m: p.mountHeightM,
    figures: p.figures,
    scheduled_for: p.scheduledFor,
    notes: p.notes,
    created_by: p.createdBy,
    created_by_name: p.createdByName,
    created_at: p.createdAt.toISOString(),
    updated_at: p.updatedAt.toISOString(),
    state_changed_at: p.stateChangedAt.toISOString(),
    row_version: p.rowVersion,
  };
}

function checkJson(c: InstallCheck): InstallCheckJson {
  return {
    id: c.id,
    plan_id: c.planId,
    phase: c.phase,
    taken_at: c.takenAt.toISOString(),
    notes: c.notes,
    created_by: c.createdBy,
    created_by_name: c.createdByName,
    created_at: c.createdAt.toISOString(),
    readings: c.readings.map((r) => ({ pci: r.pci, channel: r.channel, rsrp_dbm: r.rsrpDbm, rsrq_db: r.rsrqDb, sinr_db: r.sinrDb })),
    speed_tests: c.speedTests.map((t) => ({ down_mbps: t.downMbps, up_mbps: t.upMbps, latency_ms: t.latencyMs })),
  };
}

const speedJson = (s: SpeedSummary): SpeedSummaryJson => ({ tests: s.tests, down_mbps: s.downMbps, up_mbps: s.upMbps, latency_ms: s.latencyMs });

export function planDetailJson(p: PlanDetail): PlanDetailJson {
  return {
    ...planJson(p),
    checks: p.checks.map(checkJson),
    result: {
      before_check_id: p.result.beforeCheckId,
      after_check_id: p.result.afterCheckId,
      predicted_rsrp_dbm: p.result.predictedRsrpDbm,
      expected_throughput_mbps: p.result.expectedThroughputMbps,
      gains: p.result.gains.map((g) => ({
        pci: g.pci,
        channel: g.channel,
        samples_before: g.samplesBefore,
        samples_after: g.samplesAfter,
        before_rsrp_dbm: g.beforeRsrpDbm,
        after_rsrp_dbm: g.afterRsrpDbm,
        measured_gain_db: g.measuredGainDb,
        predicted_gain_db: g.predictedGainDb,
        difference_db: g.differenceDb,
        before_sinr_db: g.beforeSinrDb,
        after_sinr_db: g.afterSinrDb,
        sinr_change_db: g.sinrChangeDb,
      })),
      speed_before: speedJson(p.result.speedBefore),
      speed_after: speedJson(p.result.speedAfter),
    },
  };
}

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
  const checks = await db('install_checks as c')
    .leftJoin('users as u', 'u.id', 'c.created_by')
    .where('c.plan_id', planId)
    .orderBy([{ column: 'c.taken_at' }, { column: 'c.id' }])
    .select('c.*', 'u.name as created_by_name');
  if (checks.length === 0) return [];
  const ids = checks.map((c) => c.id);
  const readings = await db('install_check_readings').whereIn('check_id', ids).orderBy('id');
  const tests = await db('install_check_speed_tests').whereIn('check_id', ids).orderBy('id');
  return checks.map((c) => ({
    id: String(c.id),
    planId: String(c.plan_id),
    phase: c.phase,
    takenAt: c.taken_at,
    notes: c.notes,
    createdBy: str(c.created_by),
    createdByName: c.created_by_name,
    createdAt: c.created_at,
    readings: readings
      .filter((r) => String(r.check_id) === String(c.id))
      .map((r) => ({ pci: r.pci, channel: r.channel, rsrpDbm: r.rsrp_dbm, rsrqDb: r.rsrq_db, sinrDb: r.sinr_db })),
    speedTests: tests.filter((t) => String(t.check_id) === String(c.id)).map((t) => ({ downMbps: t.down_mbps, upMbps: t.up_mbps, latencyMs: t.latency_ms })),
  }));
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

function auditView(p: Plan) {
  return {
    customer_id: p.customerId,
    state: p.state,
    cell_id: p.cellId,
    antenna_id: p.antennaId,
    cable_id: p.cableId,
    cable_m: p.cableM,
    mount_height_m: p.mountHeightM,
    scheduled_for: p.scheduledFor,
    notes: p.notes,
    figures: p.figures,
  };
}

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
    .insert({
      customer_id: input.customerId,
      cell_id: input.cellId,
      antenna_id: input.antennaId,
      cable_id: input.cableId,
      cable_m: input.cableM,
      mount_height_m: input.mountHeightM,
      figures: JSON.stringify(input.figures),
      scheduled_for: input.scheduledFor,
      notes: input.notes,
      state: input.state,
      created_by: actorId,
      updated_by: actorId,
    })
    .returning('id');
  await db('customers').where({ id: input.customerId }).update({ updated_at: db.fn.now() });
  const plan = await findPlan(db, String(row.id));
  await recordAudit(db, { userId: actorId, action: 'create', entity: 'plan', entityId: plan.id, after: auditView(plan) });
  return plan;
}

const KIT_FIELDS = ['cellId', 'antennaId', 'cableId', 'cableM', 'mountHeightM', 'figures'] as const;
const SNAKE: Record<(typeof KIT_FIELDS)[number], string> = {
  cellId: 'cell_id',
  antennaId: 'antenna_id',
  cableId: 'cable_id',
  cableM: 'cable_m',
  mountHeightM: 'mount_height_m',
  figures: 'figures',
};

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

  // Figures follow the kit (the server computes them), so only the kit fields themselves are named.
  const kitChanges = KIT_FIELDS.filter((k) => k !== 'figures' && change[k] !== undefined && JSON.stringify(change[k]) !== JSON.stringify(before[k]));
  if (kitChanges.length && isKitLocked(before.state) && isKitLocked(to)) {
    const fields = Object.fromEntries(kitChanges.map((k) => [SNAKE[k], ['Fixed once installed; move the plan back to scheduled to change it']]));
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

  const patch: Record<string, unknown> = { updated_at: db.fn.now(), updated_by: actorId, row_version: db.raw('row_version + 1') };
  if (change.cellId !== undefined) patch.cell_id = change.cellId;
  if (change.antennaId !== undefined) patch.antenna_id = change.antennaId;
  if (change.cableId !== undefined) patch.cable_id = change.cableId;
  if (change.cableM !== undefined) patch.cable_m = change.cableM;
  if (change.mountHeightM !== undefined) patch.mount_height_m = change.mountHeightM;
  if (change.figures !== undefined) patch.figures = JSON.stringify(change.figures);
  if (change.scheduledFor !== undefined) patch.scheduled_for = change.scheduledFor;
  if (change.notes !== undefined) patch.notes = change.notes;
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
    .insert({ plan_id: planId, phase: input.phase, taken_at: input.takenAt ?? now, notes: input.notes, created_by: actorId })
    .returning('id');
  const checkId = String(row.id);
  if (input.readings.length) {
    await db('install_check_readings').insert(
      input.readings.map((r) => ({ check_id: checkId, pci: r.pci, channel: r.channel, rsrp_dbm: r.rsrpDbm, rsrq_db: r.rsrqDb, sinr_db: r.sinrDb })),
    );
  }
  if (input.speedTests.length) {
    await db('install_check_speed_tests').insert(
      input.speedTests.map((t) => ({ check_id: checkId, down_mbps: t.downMbps, up_mbps: t.upMbps, latency_ms: t.latencyMs })),
    );
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

export { checkJson as installCheckJson };
