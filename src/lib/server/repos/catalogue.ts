// The team's catalogue of customer antennas and cables.
import type { Tx } from '../db';
import type { CableLossPoint, GainPoint } from '../../domain/link-budget';
import {
  getBeamwidthProblem,
  type AntennaChange,
  type AntennaInput,
  type AntennaJson,
  type AntennaKind,
  type CableChange,
  type CableInput,
  type CableJson,
} from '../../schemas/catalogue';
import { ConflictError, NotFoundError, ValidationError } from '../errors';
import { recordAudit } from './audit';

export interface Antenna {
  id: string;
  name: string;
  kind: AntennaKind;
  ports: number;
  horizontalBeamwidthDeg: number;
  gainTable: GainPoint[];
  notes: string | null;
  createdAt: Date;
  updatedAt: Date;
}

export interface Cable {
  id: string;
  name: string;
  lossTable: CableLossPoint[];
  connectorLossDb: number;
  connectors: number;
  notes: string | null;
  createdAt: Date;
  updatedAt: Date;
}

interface AntennaRow {
  id: string;
  name: string;
  kind: AntennaKind;
  ports: number;
  horizontal_beamwidth_deg: number;
  gain_table: { freq_mhz: number; gain_dbi: number }[];
  notes: string | null;
  created_at: Date;
  updated_at: Date;
}

interface CableRow {
  id: string;
  name: string;
  loss_table: { freq_mhz: number; loss_db_per_m: number }[];
  connector_loss_db: number;
  connectors: number;
  notes: string | null;
  created_at: Date;
  updated_at: Date;
}

function toAntenna(r: AntennaRow): Antenna {
  return {
    id: String(r.id),
    name: r.name,
    kind: r.kind,
    ports: r.ports,
    horizontalBeamwidthDeg: r.horizontal_beamwidth_deg,
    gainTable: r.gain_table.map((p) => ({ freqMhz: p.freq_mhz, gainDbi: p.gain_dbi })),
    notes: r.notes,
    createdAt: r.created_at,
    updatedAt: r.updated_at,
  };
}

function toCable(r: CableRow): Cable {
  return {
    id: String(r.id),
    name: r.name,
    lossTable: r.loss_table.map((p) => ({ freqMhz: p.freq_mhz, dbPerM: p.loss_db_per_m })),
    connectorLossDb: r.connector_loss_db,
    connectors: r.connectors,
    notes: r.notes,
    createdAt: r.created_at,
    updatedAt: r.updated_at,
  };
}

const gainRows = (t: GainPoint[]) => JSON.stringify(t.map((p) => ({ freq_mhz: p.freqMhz, gain_dbi: p.gainDbi })));
const lossRows = (t: CableLossPoint[]) => JSON.stringify(t.map((p) => ({ freq_mhz: p.freqMhz, loss_db_per_m: p.dbPerM })));

export function antennaJson(a: Antenna): AntennaJson {
  return {
    id: a.id,
    name: a.name,
    kind: a.kind,
    ports: a.ports,
    horizontal_beamwidth_deg: a.horizontalBeamwidthDeg,
    gain_table: a.gainTable.map((p) => ({ freq_mhz: p.freqMhz, gain_dbi: p.gainDbi })),
    notes: a.notes,
    created_at: a.createdAt.toISOString(),
    updated_at: a.updatedAt.toISOString(),
  };
}

export function cableJson(c: Cable): CableJson {
  return {
    id: c.id,
    name: c.name,
    loss_table: c.lossTable.map((p) => ({ freq_mhz: p.freqMhz, loss_db_per_m: p.dbPerM })),
    connector_loss_db: c.connectorLossDb,
    connectors: c.connectors,
    notes: c.notes,
    created_at: c.createdAt.toISOString(),
    updated_at: c.updatedAt.toISOString(),
  };
}

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
  const rows = await db<AntennaRow>('antennas').orderBy([{ column: 'kind' }, { column: 'name' }]);
  return rows.map(toAntenna);
}

export async function findAntenna(db: Tx, id: string): Promise<Antenna> {
  const row = await db<AntennaRow>('antennas').where({ id }).first();
  if (!row) throw new NotFoundError('Antenna not found');
  return toAntenna(row);
}

export async function createAntenna(db: Tx, input: AntennaInput, actorId: string | null): Promise<Antenna> {
  await assertNameFree(db, 'antennas', input.name);
  const [row] = await db<AntennaRow>('antennas')
    .insert({
      name: input.name,
      kind: input.kind,
      ports: input.ports,
      horizontal_beamwidth_deg: input.horizontalBeamwidthDeg,
      gain_table: gainRows(input.gainTable) as never,
      notes: input.notes,
    })
    .returning('*');
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
  const patch: Record<string, unknown> = { updated_at: db.fn.now(), horizontal_beamwidth_deg: beam, kind };
  if (change.name !== undefined) patch.name = change.name;
  if (change.ports !== undefined) patch.ports = change.ports;
  if (change.gainTable !== undefined) patch.gain_table = gainRows(change.gainTable);
  if (change.notes !== undefined) patch.notes = change.notes;
  const [row] = await db<AntennaRow>('antennas').where({ id }).update(patch).returning('*');
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
  const rows = await db<CableRow>('cables').orderBy('name');
  return rows.map(toCable);
}

export async function findCable(db: Tx, id: string): Promise<Cable> {
  const row = await db<CableRow>('cables').where({ id }).first();
  if (!row) throw new NotFoundError('Cable not found');
  return toCable(row);
}

export async function createCable(db: Tx, input: CableInput, actorId: string | null): Promise<Cable> {
  await assertNameFree(db, 'cables', input.name);
  const [row] = await db<CableRow>('cables')
    .insert({
      name: input.name,
      loss_table: lossRows(input.lossTable) as never,
      connector_loss_db: input.connectorLossDb,
      connectors: input.connectors,
      notes: input.notes,
    })
    .returning('*');
  const cable = toCable(row!);
  await recordAudit(db, { userId: actorId, action: 'create', entity: 'cable', entityId: cable.id, after: cableJson(cable) });
  return cable;
}

export async function updateCable(db: Tx, id: string, change: CableChange, actorId: string): Promise<Cable> {
  const before = await findCable(db, id);
  if (change.name !== undefined) await assertNameFree(db, 'cables', change.name, id);
  const patch: Record<string, unknown> = { updated_at: db.fn.now() };
  if (change.name !== undefined) patch.name = change.name;
  if (change.lossTable !== undefined) patch.loss_table = lossRows(change.lossTable);
  if (change.connectorLossDb !== undefined) patch.connector_loss_db = change.connectorLossDb;
  if (change.connectors !== undefined) patch.connectors = change.connectors;
  if (change.notes !== undefined) patch.notes = change.notes;
  const [row] = await db<CableRow>('cables').where({ id }).update(patch).returning('*');
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
