// Mobile network operators (MCC/MNC) and their map colours.
import type { Tx } from '../db';
import { OPERATOR, pickDefaultColour, type Operator, type OperatorChange, type OperatorInput } from '../../schemas/operators';
import { ConflictError, NotFoundError } from '../errors';
import { recordAudit } from './audit';
import { recordColumns } from './record-sql';

export type { Operator };

function selectOperators(db: Tx) {
  return db('operators as o').select(recordColumns(db, OPERATOR, 'o'));
}

const toOperator = (row: Record<string, unknown>): Operator => OPERATOR.fromRow(row);

export async function listOperators(db: Tx): Promise<Operator[]> {
  const rows = await selectOperators(db).orderBy('o.id');
  return rows.map(toOperator);
}

export async function findOperator(db: Tx, id: string): Promise<Operator> {
  const row = await selectOperators(db).where('o.id', id).first();
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
    .insert({ ...OPERATOR.insertRow(input), colour: input.colour ?? pickDefaultColour(used) })
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
  await db('operators')
    .where({ id })
    .update({ ...OPERATOR.patchRow(change), updated_at: db.fn.now() });
  const after = await findOperator(db, id);
  await recordAudit(db, { userId: actorId, action: 'update', entity: 'operator', entityId: id, before: auditView(before), after: auditView(after) });
  return after;
}

const auditView = (o: Operator) => OPERATOR.auditView(o);
