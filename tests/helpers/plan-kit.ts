// What a plan points at: one operator's cell on a mast, a panel antenna and a feeder cable, written
// straight into the test database.
import type { Knex } from 'knex';

export interface PlanKit {
  cellId: string;
  antennaId: string;
  cableId: string;
}

/** The kit's cell as the API shows it: LTE B20, EARFCN 6300 = 806 MHz (3GPP TS 36.101 Table 5.7.3-1). */
export const KIT_CELL = { tech: 'lte', band: 'B20', channel: 6300, dl_mhz: 806, pci: 101, sector_azimuth_deg: 180 } as const;

type Columns = Record<string, unknown>;

/** Columns a test sets beyond (or instead of) the defaults, per row. */
export interface PlanKitColumns {
  mast?: Columns;
  cell?: Columns;
  antenna?: Columns;
  cable?: Columns;
}

/** "Test Hill" at lon −128.5, lat −47.1 with the `KIT_CELL`, "Panel" (7.5 dBi) and "Feeder" (0.12 dB/m). */
export async function insertPlanKit(db: Knex, columns: PlanKitColumns = {}): Promise<PlanKit> {
  const [op] = await db('operators').insert({ name: 'Test Mobile', mcc: '001', mnc: '01', colour: '#336699' }).returning('id');
  const [mast] = await db('masts')
    .insert({ name: 'Test Hill', geom: db.raw('ST_SetSRID(ST_MakePoint(-128.5, -47.1), 4326)'), ...columns.mast })
    .returning('id');
  const [cell] = await db('cells')
    .insert({ mast_id: mast.id, operator_id: op.id, ...KIT_CELL, ...columns.cell })
    .returning('id');
  const [ant] = await db('antennas')
    .insert({
      name: 'Panel',
      kind: 'directional',
      ports: 2,
      horizontal_beamwidth_deg: 40,
      gain_table: JSON.stringify([{ freq_mhz: 800, gain_dbi: 7.5 }]),
      ...columns.antenna,
    })
    .returning('id');
  const [cable] = await db('cables')
    .insert({ name: 'Feeder', loss_table: JSON.stringify([{ freq_mhz: 800, loss_db_per_m: 0.12 }]), ...columns.cable })
    .returning('id');
  return { cellId: String(cell.id), antennaId: String(ant.id), cableId: String(cable.id) };
}

/** The body of a planned plan for `customerId` with this kit (POST /api/plans). */
export const plannedPlanBody = (kit: PlanKit, customerId: string, mount: { cable_m: number; mount_height_m: number }) => ({
  customer_id: customerId,
  cell_id: kit.cellId,
  antenna_id: kit.antennaId,
  cable_id: kit.cableId,
  ...mount,
  state: 'planned',
});
