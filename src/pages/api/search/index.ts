import { getDb } from '../../../lib/server/db';
import { handler, json, parseQuery, requirePermission } from '../../../lib/server/http';
import { searchPlaces } from '../../../lib/server/repos/basemap';
import { searchMasts } from '../../../lib/server/repos/masts';
import { SearchQuerySchema } from '../../../lib/schemas/mast-query';
import { type SearchHitJson } from '../../../lib/schemas/mast-responses';

/** Masts by name or reference and places by name, each with lat/lon to fly to; masts first. */
export const GET = handler(async ({ locals, url }) => {
  requirePermission(locals, 'map:view');
  const { q, limit } = parseQuery(SearchQuerySchema, url);
  const db = getDb();
  const [masts, places] = await Promise.all([searchMasts(db, q, limit), searchPlaces(db, q, limit)]);
  const items: SearchHitJson[] = [
    ...masts.map((m): SearchHitJson => ({ kind: 'mast', id: m.id, name: m.name, detail: m.reference, lat: m.lat, lon: m.lon })),
    ...places.map((p): SearchHitJson => ({ kind: 'place', id: p.id, name: p.name, detail: p.kind, lat: p.lat, lon: p.lon })),
  ];
  return json({ items, total: items.length });
});
