import { getDb, getReadDb } from '../../../lib/server/db';
import { handler, json, parseBody, parseQuery, requirePermission } from '../../../lib/server/http';
import { createMast, listMasts } from '../../../lib/server/repos/masts';
import { mastFeatureCollectionJson, mastJson } from '../../../lib/schemas/mast-responses';
import { MastInputSchema } from '../../../lib/schemas/masts';
import { MastListQuerySchema } from '../../../lib/schemas/mast-query';

/** Masts as a GeoJSON FeatureCollection (RFC 7946), filtered by bbox, operator, band, tech and status. */
export const GET = handler(async ({ locals, url }) => {
  requirePermission(locals, 'map:view');
  const query = parseQuery(MastListQuerySchema, url);
  const list = await listMasts(getReadDb(), query);
  return json(mastFeatureCollectionJson(list), 200, { 'Content-Type': 'application/geo+json; charset=utf-8' });
});

export const POST = handler(async ({ locals, request }) => {
  const actor = requirePermission(locals, 'masts:write');
  const input = await parseBody(MastInputSchema, request);
  const mast = await getDb().transaction((trx) => createMast(trx, input, actor.id));
  return json(mastJson(mast), 201);
});
