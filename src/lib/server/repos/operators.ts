// Mobile network operators (MCC/MNC) and their map colours.
import type { Tx } from '../db';
import { pickDefaultColour, type OperatorChange, type OperatorInput, type OperatorJson } from '../../schemas/operators';
import { ConflictError, NotFoundError } from '../errors';
import { recordAudit } from './audit';

export interface Operator {
  id: string;
  name: string;
  mcc: string;
  mnc: string;
  colour: string;
  cellCount: number;
  createdAt: Date;
  updatedAt: Date;
}

interface OperatorRow {
  id: string;
  name: string;
  mcc: string;
  mnc: string;
  colour: string;
  cell_count?: string | number;
  created_at: Date;
  updated_at: Date;
}

function toOperator(r: OperatorRow): Operator {
  return {
    id: String(r.id),
    name: r.name,
    mcc: r.mcc,
    mnc: r.mnc,
    colour: r.colour,
    cellCount: Number(r.cell_count ?? 0),
    createdAt: r.created_at,
    updatedAt: r.updated_at,
  };
}

export function operatorJson(o: Operator): OperatorJson {
  return {
    id: o.id,
    name: o.name,
    mcc: o.mcc,
    mnc: o.mnc,
    plmn: `${o.mcc}-${o.mnc}`,
    colour: o.colour,
    cell_count: o.cellCount,
    created_at: o.createdAt.toISOString(),
    updated_at: o.updatedAt.toISOString(),
  };
}

function selectOperators(db: Tx) {
  return db('operators as o').select('o.*', db.raw('(SELECT count(*) FROM cells c WHERE c.operator_id = o.id) AS cell_count'));
}

export async function listOperators(db: Tx): Promise<Operator[]> {
  const rows: OperatorRow[] = await selectOperators(db).orderBy('o.id');
  return rows.map(toOperator);
}

export async function findOperator(db: Tx, id: string): Promise<Operator> {
  const row: OperatorRow | undefined = await selectOperators(db).where('o.id', id).first();
  if (!row) throw new NotFoundError('Operator not found');
  return toOperator(row);
}

async function assertCodeFree(db: Tx, mcc: string, mnc: string, exceptId?: string): Promise<void> {
  const q = db('operators').where({ mcc, mnc });
  if (exceptId) q.whereNot('id', exceptId);
  if (await q.first('id')) throw new ConflictError(`An operator with MCC ${mcc} and MNC ${mnc} already exists`);
}

// The unique index operators_name_unique answers for two creates at the same moment (409 via http.ts).
async function assertNameFree(db: Tx, name: string, exceptId?: string): Promise<void> {
  const q = db('operators').whereRaw('lower(name) = lower(?)', [name]);
  if (exceptId) q.whereNot('id', exceptId);
  if (await q.first('id')) throw new ConflictError(`An operator named ${name} already exists`);
}

export async function createOperator(db: Tx, input: OperatorInput, actorId: string | null): Promise<Operator> {
  await assertCodeFree(db, input.mcc, input.mnc);
  await assertNameFree(db, input.name);
  const used: string[] = (await db('operators').select('colour')).map((r: { colour: string }) => r.colour);
  const [row] = await db('operators')
    .insert({ name: input.name, mcc: input.mcc, mnc: input.mnc, colour: input.colour ?? pickDefaultColour(used) })
    .returning('id');
  const operator = await findOperator(db, String(row.id));
  await recordAudit(db, { userId: actorId, action: 'create', entity: 'operator', entityId: operator.id, after: auditView(operator) });
  return operator;
}

export async function updateOperator(db: Tx, id: string, change: OperatorChange, actorId: string): Promise<Operator> {
  const before = await findOperator(db, id);
  const mcc = change.mcc ?? before.mcc;
  const mnc = change.mnc ?? before.mnc;
  if (mcc !== before.mcc || mnc !== before.mnc) await assertCodeFree(db, mcc, mnc, id);
  if (change.name !== undefined && change.name !== before.name) await assertNameFree(db, change.name, id);
  const patch: Record<string, unknown> = { updated_at: db.fn.now() };
  if (change.name !== undefined) patch.name = change.name;
  if (change.mcc !== undefined) patch.mcc = change.mcc;
  if (change.mnc !== undefined) patch.mnc = change.mnc;
  if (change.colour !== undefined) patch.colour = change.colour;
  await db('operators').where({ id }).update(patch);
  const after = await findOperator(db, id);
  await recordAudit(db, { userId: actorId, action: 'update', entity: 'operator', entityId: id, before: auditView(before), after: auditView(after) });
  return after;
}

function auditView(o: Operator) {
  return { name: o.name, mcc: o.mcc, mnc: o.mnc, colour: o.colour };
}
