import { getDb } from '../../../../lib/server/db';
import { handler, json, parseWith, requirePermission } from '../../../../lib/server/http';
import { customerJson } from '../../../../lib/schemas/customers';
import { eraseCustomer } from '../../../../lib/server/repos/customer-erasure';
import { IdParamSchema } from '../../../../lib/schemas/params';
import type { CustomerErasureJson } from '../../../../lib/schemas/customers';

/**
 * Erases the customer's personal data on their request: name, contact details, address, home
 * position (kept rounded to about 11 km), notes, plan figures that locate the home, readings fed
 * back from their install, and the same values in the audit log. Plans keep their state, cell, kit
 * and radio figures. Audited; 409 when already erased.
 */
export const POST = handler(async ({ locals, params }) => {
  const actor = requirePermission(locals, 'plans:write');
  const { id } = parseWith(IdParamSchema, params);
  const { customer, summary } = await getDb().transaction((trx) => eraseCustomer(trx, id, actor.id));
  const body: CustomerErasureJson = {
    customer: customerJson(customer),
    plans_anonymised: summary.plans,
    install_checks_cleared: summary.installChecks,
    install_readings_removed: summary.installReadingsRemoved,
    audit_entries_scrubbed: summary.auditEntriesScrubbed,
  };
  return json(body);
});
