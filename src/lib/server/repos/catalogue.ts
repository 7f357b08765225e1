// The team's catalogue of customer antennas and cables.
import type { Tx } from '../db';
import {
  ANTENNA,
  CABLE,
  antennaJson,
  cableJson,
  getBeamwidthProblem,
  type Antenna,
  type AntennaChange,
  type AntennaInput,
  type Cable,
  type CableChange,
  type CableInput,
} from '../../schemas/catalogue';
import { ConflictError, NotFoundError, ValidationError } from '../errors';
import { recordAudit } from './audit';

export type { Antenna, Cable };

const toAntenna = (row: Record<string, unknown>): Antenna => ANTENNA.fromRow(row);
const toCable = (row: Record<string, unknown>): Cable => CABLE.fromRow(row);

async function assertNameFree(db: Tx, table: 'antennas' | 'cables', name: string, exceptId?: string) {
  const q = db(table).whereRaw('lower(name) = lower(?)', [name]);
  if (exceptId) q.whereNot({ id: exceptId });
  if (await q.first('id')) {
    const what = table === 'antennas' ? 'An antenna' : 'A cable';
    throw new ConflictError(`${what} named “${name}” is already in the catalogue`);
  }
}

// --- antennas -----------------------------------------------------------------------------

export async function listAntennas(db: Tx): Promise<Antenna[]> {
  const rows = await db('antennas').orderBy([{ column: 'kind' }, { column: 'name' }]);
  return rows.map(toAntenna);
}

export async function findAntenna(db: Tx, id: string): Promise<Antenna> {
  const row = await db('antennas').where({ id }).first();
  if (!row) throw new NotFoundError('Antenna not found');
  return toAntenna(row);
}

export async function createAntenna(db: Tx, input: AntennaInput, actorId: string | null): Promise<Antenna> {
  await assertNameFree(db, 'antennas', input.name);
  const [row] = await db('antennas').insert(ANTENNA.insertRow(input)).returning('*');
  const antenna = toAntenna(row!);
  await recordAudit(db, { userId: actorId, action: 'create', entity: 'antenna', entityId: antenna.id, after: antennaJson(antenna) });
  return antenna;
}

export async function updateAntenna(db: Tx, id: string, change: AntennaChange, actorId: string): Promise<Antenna> {
  const before = await findAntenna(db, id);
  if (change.name !== undefined) await assertNameFree(db, 'antennas', change.name, id);
  // A kind change alone moves omni/stub to 360° and asks a directional one for its beam.
  const kind = change.kind ?? before.kind;
  let beam = change.horizontalBeamwidthDeg ?? before.horizontalBeamwidthDeg;
  if (change.kind && change.kind !== 'directional' && change.horizontalBeamwidthDeg === undefined) beam = 360;
  const problem = getBeamwidthProblem(kind, beam);
  if (problem) throw new ValidationError(problem, { horizontal_beamwidth_deg: [problem] });
  const patch = { ...ANTENNA.patchRow(change), updated_at: db.fn.now(), horizontal_beamwidth_deg: beam, kind };
  const [row] = await db('antennas').where({ id }).update(patch).returning('*');
  const after = toAntenna(row!);
  await recordAudit(db, { userId: actorId, action: 'update', entity: 'antenna', entityId: id, before: antennaJson(before), after: antennaJson(after) });
  return after;
}

async function countPlansUsing(db: Tx, column: 'antenna_id' | 'cable_id', id: string): Promise<number> {
  const row = await db('plans').where(column, id).count<{ count: string }[]>('* as count').first();
  return Number(row?.count ?? 0);
}

export async function deleteAntenna(db: Tx, id: string, actorId: string): Promise<void> {
  const before = await findAntenna(db, id);
  const used = await countPlansUsing(db, 'antenna_id', id);
  if (used > 0) throw new ConflictError(`“${before.name}” is part of ${used} plan${used === 1 ? '' : 's'}; it cannot be deleted`);
  // Customers' current antenna is what their expected gain is measured against: never clear it silently.
  const row = await db('customers').where('current_antenna_id', id).count<{ count: string }[]>('* as count').first();
  const customers = Number(row?.count ?? 0);
  if (customers > 0) {
    throw new ConflictError(`“${before.name}” is the current antenna of ${customers} customer${customers === 1 ? '' : 's'}; it cannot be deleted`);
  }
  await db('antennas').where({ id }).delete();
  await recordAudit(db, { userId: actorId, action: 'delete', entity: 'antenna', entityId: id, before: antennaJson(before) });
}

// --- cables -------------------------------------------------------------------------------

export async function listCables(db: Tx): Promise<Cable[]> {
  const rows = await db('cables').orderBy('name');
  return rows.map(toCable);
}

export async function findCable(db: Tx, id: string): Promise<Cable> {
  const row = await db('cables').where({ id }).first();
  if (!row) throw new NotFoundError('Cable not found');
  return toCable(row);
}

export async function createCable(db: Tx, input: CableInput, actorId: string | null): Promise<Cable> {
  await assertNameFree(db, 'cables', input.name);
  const [row] = await db('cables').insert(CABLE.insertRow(input)).returning('*');
  const cable = toCable(row!);
  await recordAudit(db, { userId: actorId, action: 'create', entity: 'cable', entityId: cable.id, after: cableJson(cable) });
  return cable;
}

export async function updateCable(db: Tx, id: string, change: CableChange, actorId: string): Promise<Cable> {
  const before = await findCable(db, id);
  if (change.name !== undefined) await assertNameFree(db, 'cables', change.name, id);
  const patch = { ...CABLE.patchRow(change), updated_at: db.fn.now() };
  const [row] = await db('cables').where({ id }).update(patch).returning('*');
  const after = toCable(row!);
  await recordAudit(db, { userId: actorId, action: 'update', entity: 'cable', entityId: id, before: cableJson(before), after: cableJson(after) });
  return after;
}

export async function deleteCable(db: Tx, id: string, actorId: string): Promise<void> {
  const before = await findCable(db, id);
  const used = await countPlansUsing(db, 'cable_id', id);
  if (used > 0) throw new ConflictError(`“${before.name}” is part of ${used} plan${used === 1 ? '' : 's'}; it cannot be deleted`);
  await db('cables').where({ id }).delete();
  await recordAudit(db, { userId: actorId, action: 'delete', entity: 'cable', entityId: id, before: cableJson(before) });
}
