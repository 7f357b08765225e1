// The installers' schedule: booked visits with what an installer needs on the roof.
import type { Tx } from '../db';
import type { PlanState } from '../../domain/plan-state';
import { getWeekOf } from '../../domain/schedule';

export interface ScheduledVisit {
  planId: string;
  state: PlanState;
  scheduledFor: string;
  rowVersion: number;
  customerId: string;
  customerName: string;
  addressLabel: string;
  postcode: string | null;
  phone: string | null;
  mastName: string | null;
  operatorName: string | null;
  tech: string | null;
  band: string | null;
  channel: number | null;
  pci: number | null;
  antennaName: string | null;
  mountHeightM: number | null;
  /** From the figures saved with the plan's kit. */
  bearingTrueDeg: number | null;
  bearingMagneticDeg: number | null;
  afterCheckCount: number;
}

const num = (v: unknown) => (v === null || v === undefined ? null : Number(v));

/**
 * Every scheduled plan (past due ones too), and the installed plans that belong to the period on
 * show: this week's visits, and visits due before this week that were installed this week (a past
 * due job done today stays in view, as installed, so its install check can be recorded).
 */
export async function listScheduledVisits(db: Tx, today: string): Promise<ScheduledVisit[]> {
  const { monday } = getWeekOf(today);
  const rows = await db('plans as p')
    .join('customers as cu', 'cu.id', 'p.customer_id')
    .leftJoin('cells as ce', 'ce.id', 'p.cell_id')
    .leftJoin('masts as m', 'm.id', 'ce.mast_id')
    .leftJoin('operators as o', 'o.id', 'ce.operator_id')
    .leftJoin('antennas as a', 'a.id', 'p.antenna_id')
    .whereNotNull('p.scheduled_for')
    .where((w) =>
      w
        .where('p.state', 'scheduled')
        .orWhere((i) =>
          i.where('p.state', 'installed').where((since) => since.where('p.scheduled_for', '>=', monday).orWhere('p.state_changed_at', '>=', monday)),
        ),
    )
    .orderBy([{ column: 'p.scheduled_for' }, { column: 'cu.name' }, { column: 'p.id' }])
    .select(
      'p.id',
      'p.state',
      db.raw("to_char(p.scheduled_for, 'YYYY-MM-DD') AS scheduled_for"),
      'p.row_version',
      'p.customer_id',
      'cu.name as customer_name',
      'cu.address_label',
      'cu.postcode',
      'cu.phone',
      'm.name as mast_name',
      'o.name as operator_name',
      'ce.tech',
      'ce.band',
      'ce.channel',
      'ce.pci',
      'a.name as antenna_name',
      'p.mount_height_m',
      db.raw("(p.figures->>'bearing_true_deg')::float AS bearing_true_deg"),
      db.raw("(p.figures->>'bearing_magnetic_deg')::float AS bearing_magnetic_deg"),
      db.raw("(SELECT count(*) FROM install_checks c WHERE c.plan_id = p.id AND c.phase = 'after') AS after_check_count"),
    );
  return rows.map((r) => ({
    planId: String(r.id),
    state: r.state,
    scheduledFor: r.scheduled_for,
    rowVersion: r.row_version,
    customerId: String(r.customer_id),
    customerName: r.customer_name,
    addressLabel: r.address_label,
    postcode: r.postcode,
    phone: r.phone,
    mastName: r.mast_name,
    operatorName: r.operator_name,
    tech: r.tech,
    band: r.band,
    channel: r.channel,
    pci: r.pci,
    antennaName: r.antenna_name,
    mountHeightM: num(r.mount_height_m),
    bearingTrueDeg: num(r.bearing_true_deg),
    bearingMagneticDeg: num(r.bearing_magnetic_deg),
    afterCheckCount: Number(r.after_check_count),
  }));
}
