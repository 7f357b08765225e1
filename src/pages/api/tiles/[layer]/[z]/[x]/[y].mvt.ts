import { createHash } from 'node:crypto';
import { getDb } from '../../../../../../lib/server/db';
import { handler, parseQuery, parseWith, requirePermission } from '../../../../../../lib/server/http';
import { getBasemapTile, getMastsTile } from '../../../../../../lib/server/repos/tiles';
import { MastFilterSchema, TileParamsSchema } from '../../../../../../lib/schemas/masts';

// The basemap is invented public geography, so its tiles are public and cacheable by anyone for a
// day (an admin re-import shows up after that, or at once for clients that revalidate the ETag).
// Mast tiles need 'map:view' and stay private and short-lived, since masts are edited all day.
const CACHE_BASEMAP = 'public, max-age=86400, stale-while-revalidate=604800';
const CACHE_MASTS = 'private, max-age=60';

function isFresh(ifNoneMatch: string | null, etag: string): boolean {
  if (!ifNoneMatch) return false;
  return ifNoneMatch.split(',').some((tag) => {
    const t = tag.trim();
    return t === '*' || t.replace(/^W\//, '') === etag;
  });
}

function tileResponse(body: Buffer, cacheControl: string, ifNoneMatch: string | null): Response {
  if (body.length === 0) return new Response(null, { status: 204, headers: { 'Cache-Control': cacheControl } });
  const etag = `"${createHash('sha1').update(body).digest('base64url')}"`;
  const headers = { 'Cache-Control': cacheControl, ETag: etag };
  if (isFresh(ifNoneMatch, etag)) return new Response(null, { status: 304, headers });
  return new Response(new Uint8Array(body), {
    status: 200,
    headers: { ...headers, 'Content-Type': 'application/vnd.mapbox-vector-tile', 'Content-Length': String(body.length) },
  });
}

/** Mapbox Vector Tile of the basemap (public) or the masts (map:view; ?operator=&band=&tech=&status=). */
export const GET = handler(async ({ locals, params, url, request }) => {
  if (params.layer === 'masts') requirePermission(locals, 'map:view');
  const tile = parseWith(TileParamsSchema, params);
  const ifNoneMatch = request.headers.get('if-none-match');
  if (tile.layer === 'masts') {
    const filter = parseQuery(MastFilterSchema, url);
    return tileResponse(await getMastsTile(getDb(), tile, filter), CACHE_MASTS, ifNoneMatch);
  }
  return tileResponse(await getBasemapTile(getDb(), tile), CACHE_BASEMAP, ifNoneMatch);
});
