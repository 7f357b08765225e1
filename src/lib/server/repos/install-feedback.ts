// Verified installs feed their after-install readings back as readings of the cells they
// measured, so the shortlist's calibration learns from them for nearby customers.
import type { Tx } from '../db';
import { getCableLossDb, getConnectorLossDb, interpolateGain, type CableLossPoint, type GainPoint } from '../../domain/link-budget';
import { DEFAULT_SEARCH_RADIUS_M } from '../../domain/shortlist';

interface PlanRow {
  id: string;
  state: string;
  cell_id: string | null;
  antenna_gain: { freq_mhz: number; gain_dbi: number }[] | null;
  cable_loss: { freq_mhz: number; loss_db_per_m: number }[] | null;
  connector_loss_db: number | null;
  connectors: number | null;
  cable_m: number | null;
  mount_height_m: number | null;
  lat: number;
  lon: number;
  erased_at: Date | null;
}

/** Net gain of the installed antenna and feeder at a frequency (what the router's reading went through). */
function getNetGainDbi(plan: PlanRow, freqMhz: number): number | null {
  if (!plan.antenna_gain?.length) return null;
  const table: GainPoint[] = plan.antenna_gain.map((p) => ({ freqMhz: p.freq_mhz, gainDbi: p.gain_dbi }));
  let net = interpolateGain(table, freqMhz).gainDbi;
  if (plan.cable_loss?.length && plan.cable_m) {
    const loss: CableLossPoint[] = plan.cable_loss.map((p) => ({ freqMhz: p.freq_mhz, dbPerM: p.loss_db_per_m }));
    net -= getCableLossDb(loss, freqMhz, plan.cable_m).lossDb;
    net -= getConnectorLossDb(plan.connectors ?? 2, plan.connector_loss_db ?? undefined);
  }
  return net;
}

/**
 * Makes the readings fed back from a plan match its state: a verified plan contributes its latest
 * after-install check (each PCI matched to the plan's cell, or to the nearest cell on that channel
 * and PCI); any other state contributes nothing. Returns how many readings it holds now.
 */
export async function syncInstallReadings(db: Tx, planId: string): Promise<number> {
  const checkIds = db('install_checks').where({ plan_id: planId }).select('id');
  await db('readings').whereIn('install_check_id', checkIds).delete();

  const plan: PlanRow | undefined = await db('plans as p')
    .join('customers as cu', 'cu.id', 'p.customer_id')
    .leftJoin('antennas as a', 'a.id', 'p.antenna_id')
    .leftJoin('cables as cb', 'cb.id', 'p.cable_id')
    .where('p.id', planId)
    .first(
      'p.id',
      'p.state',
      'p.cell_id',
      'cu.erased_at',
      'p.cable_m',
      'p.mount_height_m',
      'a.gain_table as antenna_gain',
      'cb.loss_table as cable_loss',
      'cb.connector_loss_db',
      'cb.connectors',
      db.raw('ST_Y(cu.geom) as lat'),
      db.raw('ST_X(cu.geom) as lon'),
    );
  // An erased customer's home is no longer known: their installs feed nothing back.
  if (!plan || plan.state !== 'verified' || plan.erased_at) return 0;
  const check = await db('install_checks')
    .where({ plan_id: planId, phase: 'after' })
    .orderBy([
      { column: 'taken_at', order: 'desc' },
      { column: 'id', order: 'desc' },
    ])
    .first('id', 'taken_at');
  if (!check) return 0;
  const readings = await db('install_check_readings').where({ check_id: check.id });
  const planCell = plan.cell_id ? await db('cells').where({ id: plan.cell_id }).first('id', 'tech', 'channel', 'pci', 'dl_mhz') : null;
  const point = db.raw('ST_SetSRID(ST_MakePoint(?, ?), 4326)', [plan.lon, plan.lat]);

  let count = 0;
  for (const r of readings) {
    const cell =
      planCell && planCell.pci === r.pci && (r.channel === null || r.channel === planCell.channel)
        ? planCell
        : await db('cells as c')
            .join('masts as m', 'm.id', 'c.mast_id')
            .where('c.pci', r.pci)
            .modify((q) => {
              if (r.channel !== null) q.where('c.channel', r.channel);
              else if (planCell) q.where('c.channel', planCell.channel);
            })
            .whereRaw('ST_DWithin(m.geom::geography, ?::geography, ?)', [point, DEFAULT_SEARCH_RADIUS_M])
            .orderByRaw('m.geom::geography <-> ?::geography', [point])
            .first('c.id', 'c.tech', 'c.channel', 'c.pci', 'c.dl_mhz');
    if (!cell || cell.dl_mhz === null) continue;
    await db('readings').insert({
      taken_at: check.taken_at,
      geom: point,
      tech: cell.tech,
      channel: cell.channel,
      pci: r.pci,
      rsrp_dbm: r.rsrp_dbm,
      rsrq_db: r.rsrq_db,
      sinr_db: r.sinr_db,
      cell_id: cell.id,
      device: 'installed kit',
      source: 'install_check',
      antenna_gain_dbi: getNetGainDbi(plan, Number(cell.dl_mhz)),
      height_m: plan.mount_height_m,
      install_check_id: check.id,
    });
    count += 1;
  }
  return count;
}
