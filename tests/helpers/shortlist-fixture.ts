// Masts and LTE cells written straight into the test database, for shortlist fixtures.
import type { Knex } from 'knex';
import { KIT_CELL } from './plan-kit';

/** A mast at `p` on 100 m ground, 40 m tall, with any other columns given; its id. */
export async function insertMast(db: Knex, name: string, p: { lat: number; lon: number }, columns: Record<string, unknown> = {}): Promise<string> {
  const [row] = await db('masts')
    .insert({ name, geom: db.raw('ST_SetSRID(ST_MakePoint(?, ?), 4326)', [p.lon, p.lat]), ground_elevation_m: 100, structure_height_m: 40, ...columns })
    .returning('id');
  return String(row.id);
}

/** An LTE B20 cell (`KIT_CELL`: EARFCN 6300, 806 MHz) on one sector of a mast; its id. */
export async function insertB20Cell(
  db: Knex,
  mastId: string,
  operatorId: string,
  sector: { azimuthDeg: number; heightM: number; pci: number },
): Promise<string> {
  const [row] = await db('cells')
    .insert({ mast_id: mastId, operator_id: operatorId, ...KIT_CELL, pci: sector.pci, sector_azimuth_deg: sector.azimuthDeg, antenna_height_m: sector.heightM })
    .returning('id');
  return String(row.id);
}
