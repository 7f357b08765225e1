// Erasure of one customer's personal data on their request (right to erasure). The customer row
// stays so that plans, install checks and the team's statistics keep their non-personal history;
// everything that names the person or places their home is removed, including the old values in
// the audit log. One audit entry records what was done, without the erased values.
import type { Tx } from '../db';
import { ConflictError, NotFoundError } from '../errors';
import {
  ERASED_ADDRESS_LABEL,
  ERASED_POSITION_DECIMALS,
  PERSONAL_CUSTOMER_FIELDS,
  PERSONAL_PLAN_FIELDS,
  getAnonymisedFigures,
  getCoarsePosition,
  getErasedName,
  getScrubbedAuditValue,
} from '../../domain/erasure';
import { recordAudit } from './audit';
import { findCustomer, type Customer } from './customers';

export interface ErasureSummary {
  plans: number;
  installChecks: number;
  installReadingsRemoved: number;
  auditEntriesScrubbed: number;
}

async function scrubAuditEntries(db: Tx, entity: string, entityIds: string[], personal: readonly string[]): Promise<number> {
  if (entityIds.length === 0) return 0;
  const rows: { id: string; before: unknown; after: unknown }[] = await db('audit_log')
    .where({ entity })
    .whereIn('entity_id', entityIds)
    .select('id', 'before', 'after');
  for (const r of rows) {
    await db('audit_log')
      .where({ id: r.id })
      .update({
        before: r.before === null ? null : JSON.stringify(getScrubbedAuditValue(r.before, personal)),
        after: r.after === null ? null : JSON.stringify(getScrubbedAuditValue(r.after, personal)),
      });
  }
  return rows.length;
}

export async function eraseCustomer(db: Tx, id: string, actorId: string): Promise<{ customer: Customer; summary: ErasureSummary }> {
  const row = await db('customers').where({ id }).forUpdate().first('erased_at', db.raw('ST_Y(geom) AS lat'), db.raw('ST_X(geom) AS lon'));
  if (!row) throw new NotFoundError('Customer not found');
  if (row.erased_at) throw new ConflictError(`This customer's personal data was already erased on ${(row.erased_at as Date).toISOString().slice(0, 10)}`);

  const coarse = getCoarsePosition({ lat: row.lat, lon: row.lon });
  await db('customers')
    .where({ id })
    .update({
      name: getErasedName(id),
      phone: null,
      email: null,
      address_label: ERASED_ADDRESS_LABEL,
      postcode: null,
      notes: null,
      geom: db.raw('ST_SetSRID(ST_MakePoint(?, ?), 4326)', [coarse.lon, coarse.lat]),
      erased_at: db.fn.now(),
      updated_at: db.fn.now(),
      updated_by: actorId,
      row_version: db.raw('row_version + 1'),
    });

  const plans: { id: string; figures: Record<string, unknown> | null }[] = await db('plans').where({ customer_id: id }).forUpdate().select('id', 'figures');
  for (const p of plans) {
    await db('plans')
      .where({ id: p.id })
      .update({ notes: null, figures: JSON.stringify(getAnonymisedFigures(p.figures ?? {})), row_version: db.raw('row_version + 1') });
  }
  const planIds = plans.map((p) => String(p.id));
  const checkIds = planIds.length ? (await db('install_checks').whereIn('plan_id', planIds).select('id')).map((c) => String(c.id)) : [];
  if (checkIds.length) await db('install_checks').whereIn('id', checkIds).update({ notes: null });
  // Readings fed back from install checks were taken at the home: they go, with their position.
  const installReadingsRemoved = checkIds.length ? await db('readings').whereIn('install_check_id', checkIds).delete() : 0;

  const auditEntriesScrubbed =
    (await scrubAuditEntries(db, 'customer', [id], PERSONAL_CUSTOMER_FIELDS)) + (await scrubAuditEntries(db, 'plan', planIds, PERSONAL_PLAN_FIELDS));
  const summary: ErasureSummary = { plans: plans.length, installChecks: checkIds.length, installReadingsRemoved, auditEntriesScrubbed };
  await recordAudit(db, {
    userId: actorId,
    action: 'erase',
    entity: 'customer',
    entityId: id,
    after: {
      erased_fields: [...PERSONAL_CUSTOMER_FIELDS],
      position_rounded_to_decimals: ERASED_POSITION_DECIMALS,
      plans_anonymised: summary.plans,
      install_checks_cleared: summary.installChecks,
      install_readings_removed: summary.installReadingsRemoved,
      audit_entries_scrubbed: summary.auditEntriesScrubbed,
    },
  });
  return { customer: await findCustomer(db, id), summary };
}
