import { getReadDb } from '../../../lib/server/db';
import { handler, json, parseQuery, requirePermission } from '../../../lib/server/http';
import { createGazetteerGeocoder, geocode } from '../../../lib/server/geocoder';
import { GeocodeQuerySchema } from '../../../lib/schemas/addresses';

// Address, postcode or typed coordinates → ranked matches for every signed-in role.
export const GET = handler(async ({ locals, url }) => {
  requirePermission(locals, 'map:view');
  const { q, limit } = parseQuery(GeocodeQuerySchema, url);
  const items = await geocode(createGazetteerGeocoder(getReadDb()), q, limit);
  return json({ items, total: items.length });
});
