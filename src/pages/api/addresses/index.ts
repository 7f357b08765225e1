import { getDb } from '../../../lib/server/db';
import { handler, json, parseQuery, requirePermission } from '../../../lib/server/http';
import { listAddresses } from '../../../lib/server/repos/addresses';
import { AddressListQuerySchema, addressJson } from '../../../lib/schemas/addresses';

// The gazetteer page by page (admin page; the planner searches through /api/geocode): ?offset= or
// keyset ?after=<next of the previous page>; total_exact is false when total is an estimate.
export const GET = handler(async ({ locals, url }) => {
  requirePermission(locals, 'map:view');
  const query = parseQuery(AddressListQuerySchema, url);
  const { items, total, totalExact, next } = await listAddresses(getDb(), query);
  return json({ items: items.map(addressJson), total, total_exact: totalExact, next });
});
