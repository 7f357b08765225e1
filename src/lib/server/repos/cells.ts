// Cells: one operator's carrier on one sector of a mast. Writes are checked against the 3GPP
// channel tables (CellInputSchema) and audited.
import type { Tx } from '../db';
import { CellInputSchema, type CellChange, type CellInput, type CellJson, type Tech } from '../../schemas/masts';
import { ConflictError, NotFoundError, ValidationError } from '../errors';
import { recordAudit } from './audit';
import { assertNoPlansUseCells, unlinkReadingsOfCells } from './cell-dependents';

export interface Cell {
  id: string;
  mastId: string;
  operator: { id: string; name: string; colour: string };
  tech: Tech;
  band: string;
  channel: number;
  dlMhz: number | null;
  pci: number | null;
  cellIdentity: number | null;
  sectorAzimuthDeg: number | null;
  antennaHeightM: number | null;
  bandwidthMhz: number | null;
  rsPowerDbm: number;
  lastObservedAt: Date | null;
  rowVersion: number;
  createdAt: Date;
  updatedAt: Date;
}

interface CellRow {
  id: string;
  mast_id: string;
  operator_id: string;
  operator_name: string;
  operator_colour: string;
  tech: Tech;
  band: string;
  channel: number;
  dl_mhz: number | null;
  pci: number | null;
  cell_identity: string | null;
  sector_azimuth_deg: number | null;
  antenna_height_m: number | null;
  bandwidth_mhz: number | null;
  rs_power_dbm: number;
  last_observed_at: Date | null;
  row_version: number;
  created_at: Date;
  updated_at: Date;
}

function toCell(r: CellRow): Cell {
  return {
    id: String(r.id),
    mastId: String(r.mast_id),
    operator: { id: String(r.operator_id), name: r.operator_name, colour: r.operator_colour },
    tech: r.tech,
    band: r.band,
    channel: r.channel,
    dlMhz: r.dl_mhz,
    pci: r.pci,
    cellIdentity: r.cell_identity === null ? null : Number(r.cell_identity),
    sectorAzimuthDeg: r.sector_azimuth_deg,
    antennaHeightM: r.antenna_height_m,
    bandwidthMhz: r.bandwidth_mhz,
    rsPowerDbm: r.rs_power_dbm,
    lastObservedAt: r.last_observed_at,
    rowVersion: r.row_version,
    createdAt: r.created_at,
    updatedAt: r.updated_at,
  };
}

export function cellJson(c: Cell): CellJson {
  return {
    id: c.id,
    mast_id: c.mastId,
    operator: c.operator,
    tech: c.tech,
    band: c.band,
    channel: c.channel,
    dl_mhz: c.dlMhz,
    pci: c.pci,
    cell_identity: c.cellIdentity,
    sector_azimuth_deg: c.sectorAzimuthDeg,
    antenna_height_m: c.antennaHeightM,
    bandwidth_mhz: c.bandwidthMhz,
    rs_power_dbm: c.rsPowerDbm,
    last_observed_at: c.lastObservedAt ? c.lastObservedAt.toISOString() : null,
    row_version: c.rowVersion,
    created_at: c.createdAt.toISOString(),
    updated_at: c.updatedAt.toISOString(),
  };
}

function selectCells(db: Tx) {
  return db('cells as c').join('operators as o', 'o.id', 'c.operator_id').select('c.*', 'o.name as operator_name', 'o.colour as operator_colour');
}

/** A mast's cells by operator, technology, frequency and sector. */
export async function listCellsForMast(db: Tx, mastId: string): Promise<Cell[]> {
  const rows: CellRow[] = await selectCells(db)
    .where('c.mast_id', mastId)
    .orderBy([{ column: 'c.operator_id' }, { column: 'c.tech' }, { column: 'c.dl_mhz' }, { column: 'c.sector_azimuth_deg' }, { column: 'c.id' }]);
  return rows.map(toCell);
}

/** Like listCellsForMast, but 404 when the mast does not exist. */
export async function listCellsOfExistingMast(db: Tx, mastId: string): Promise<Cell[]> {
  if (!(await db('masts').where({ id: mastId }).first('id'))) throw new NotFoundError('Mast not found');
  return listCellsForMast(db, mastId);
}

export async function findCell(db: Tx, id: string): Promise<Cell> {
  const row: CellRow | undefined = await selectCells(db).where('c.id', id).first();
  if (!row) throw new NotFoundError('Cell not found');
  return toCell(row);
}

async function assertOperatorExists(db: Tx, operatorId: string): Promise<void> {
  if (!(await db('operators').where({ id: operatorId }).first('id'))) {
    throw new ValidationError('Some fields need attention', { operator_id: ['Unknown operator'] });
  }
}

function toRow(input: CellInput) {
  return {
    operator_id: input.operatorId,
    tech: input.tech,
    band: input.band,
    channel: input.channel,
    dl_mhz: Number.isFinite(input.dlMhz) ? input.dlMhz : null,
    pci: input.pci,
    cell_identity: input.cellIdentity,
    sector_azimuth_deg: input.sectorAzimuthDeg,
    antenna_height_m: input.antennaHeightM,
    bandwidth_mhz: input.bandwidthMhz,
    rs_power_dbm: input.rsPowerDbm,
    last_observed_at: input.lastObservedAt,
  };
}

export async function createCell(db: Tx, mastId: string, input: CellInput, actorId: string | null): Promise<Cell> {
  if (!(await db('masts').where({ id: mastId }).first('id'))) throw new NotFoundError('Mast not found');
  await assertOperatorExists(db, input.operatorId);
  const [row] = await db('cells')
    .insert({ mast_id: mastId, ...toRow(input) })
    .returning('id');
  const cell = await findCell(db, String(row.id));
  await recordAudit(db, { userId: actorId, action: 'create', entity: 'cell', entityId: cell.id, after: auditView(cell) });
  return cell;
}

/**
 * Applies a partial change and checks the whole cell again. A new technology or channel without a
 * band derives the band from the channel.
 */
export async function updateCell(db: Tx, id: string, change: CellChange, actorId: string): Promise<Cell> {
  const before = await findCell(db, id);
  const keepBand = change.band === undefined && change.tech === undefined && change.channel === undefined;
  const merged = CellInputSchema.parse({
    operator_id: change.operator_id ?? before.operator.id,
    tech: change.tech ?? before.tech,
    band: change.band !== undefined ? change.band : keepBand ? before.band : null,
    channel: change.channel ?? before.channel,
    pci: change.pci !== undefined ? change.pci : before.pci,
    cell_identity: change.cell_identity !== undefined ? change.cell_identity : before.cellIdentity,
    sector_azimuth_deg: change.sector_azimuth_deg !== undefined ? change.sector_azimuth_deg : before.sectorAzimuthDeg,
    antenna_height_m: change.antenna_height_m !== undefined ? change.antenna_height_m : before.antennaHeightM,
    bandwidth_mhz: change.bandwidth_mhz !== undefined ? change.bandwidth_mhz : before.bandwidthMhz,
    rs_power_dbm: change.rs_power_dbm ?? before.rsPowerDbm,
    last_observed_at: change.last_observed_at !== undefined ? change.last_observed_at : before.lastObservedAt,
  });
  if (merged.operatorId !== before.operator.id) await assertOperatorExists(db, merged.operatorId);
  const updated = await db('cells')
    .where(change.row_version === undefined ? { id } : { id, row_version: change.row_version })
    .update({ ...toRow(merged), updated_at: db.fn.now(), row_version: db.raw('row_version + 1') });
  if (updated === 0) {
    throw new ConflictError(`Someone else changed this cell (now version ${before.rowVersion}); reload it and make your change again`);
  }
  const after = await findCell(db, id);
  await recordAudit(db, { userId: actorId, action: 'update', entity: 'cell', entityId: id, before: auditView(before), after: auditView(after) });
  return after;
}

export async function deleteCell(db: Tx, id: string, actorId: string): Promise<void> {
  const before = await findCell(db, id);
  await assertNoPlansUseCells(db, [id], `Cell ${id}`);
  const readingsUnlinked = await unlinkReadingsOfCells(db, [id]);
  await db('cells').where({ id }).delete();
  await recordAudit(db, {
    userId: actorId,
    action: 'delete',
    entity: 'cell',
    entityId: id,
    before: { ...auditView(before), readings_unlinked: readingsUnlinked[id] ?? [] },
  });
}

/** The audited fields of a cell (also listed in a deleted mast's audit entry). */
export const cellAuditView = (c: Cell) => ({ id: c.id, ...auditView(c) });

function auditView(c: Cell) {
  return {
    mast_id: c.mastId,
    operator_id: c.operator.id,
    tech: c.tech,
    band: c.band,
    channel: c.channel,
    pci: c.pci,
    cell_identity: c.cellIdentity,
    sector_azimuth_deg: c.sectorAzimuthDeg,
    antenna_height_m: c.antennaHeightM,
    bandwidth_mhz: c.bandwidthMhz,
    rs_power_dbm: c.rsPowerDbm,
  };
}
