// What a plan points at: one operator's cell on a mast, a panel antenna and a feeder cable, written
// straight into the test database.
import type { Knex } from 'knex';

export interface PlanKit {
  cellId: string;
  antennaId: string;
  cableId: string;
}

/** "Test Hill" at lon −128.5, lat −47.1 with an LTE B20 cell (EARFCN 6300 = 806 MHz, 3GPP TS 36.101 Table 5.7.3-1), "Panel" (7.5 dBi) and "Feeder" (0.12 dB/m). */
export async function insertPlanKit(db: Knex): Promise<PlanKit> {
  const [op] = await db('operators').insert({ name: 'Test Mobile', mcc: '001', mnc: '01', colour: '#336699' }).returning('id');
  const [mast] = await db('masts')
    .insert({ name: 'Test Hill', geom: db.raw('ST_SetSRID(ST_MakePoint(-128.5, -47.1), 4326)') })
    .returning('id');
  const [cell] = await db('cells')
    .insert({ mast_id: mast.id, operator_id: op.id, tech: 'lte', band: 'B20', channel: 6300, dl_mhz: 806, pci: 101, sector_azimuth_deg: 180 })
    .returning('id');
  const [ant] = await db('antennas')
    .insert({ name: 'Panel', kind: 'directional', ports: 2, horizontal_beamwidth_deg: 40, gain_table: JSON.stringify([{ freq_mhz: 800, gain_dbi: 7.5 }]) })
    .returning('id');
  const [cable] = await db('cables')
    .insert({ name: 'Feeder', loss_table: JSON.stringify([{ freq_mhz: 800, loss_db_per_m: 0.12 }]) })
    .returning('id');
  return { cellId: String(cell.id), antennaId: String(ant.id), cableId: String(cable.id) };
}
