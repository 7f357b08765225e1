import { getReadDb } from '../../../../../../lib/server/db';
import { handler, parseQuery, parseWith, requirePermission } from '../../../../../../lib/server/http';
import { basemapTileQuery, mastsTileQuery } from '../../../../../../lib/server/repos/tiles';
import { signalTileQuery } from '../../../../../../lib/server/repos/reading-hexes';
import { getCachedTile, type CachedTile, type TileSpec } from '../../../../../../lib/server/tile-cache';
import { MastFilterSchema } from '../../../../../../lib/schemas/mast-query';
import { TileParamsSchema } from '../../../../../../lib/schemas/tiles';
import { SignalTileQuerySchema } from '../../../../../../lib/schemas/signal-map';
import { can } from '../../../../../../lib/domain/roles';

// The basemap is invented public geography, so its tiles are public and cacheable by anyone for a
// day (an admin re-import shows up after that, or at once for clients that revalidate the ETag).
// Mast tiles need 'map:view' and stay private and short-lived, since masts are edited all day.
const CACHE_BASEMAP = 'public, max-age=86400, stale-while-revalidate=604800';
const CACHE_MASTS = 'private, max-age=60';
// Signal hexagons change only when the background job recomputes them; what a role sees differs.
const CACHE_SIGNAL = 'private, max-age=60';

function isFresh(ifNoneMatch: string | null, etag: string): boolean {
  if (!ifNoneMatch) return false;
  return ifNoneMatch.split(',').some((tag) => {
    const t = tag.trim();
    return t === '*' || t.replace(/^W\//, '') === etag;
  });
}

function acceptsGzip(acceptEncoding: string | null): boolean {
  return !!acceptEncoding && /(^|,)\s*(gzip|\*)\s*(;\s*q=(?!0(\.0*)?\s*(,|$))[\d.]+)?\s*(,|$)/i.test(acceptEncoding);
}

function tileResponse(tile: CachedTile, cacheControl: string, request: Request): Response {
  if (tile.raw.length === 0) return new Response(null, { status: 204, headers: { 'Cache-Control': cacheControl } });
  const headers: Record<string, string> = { 'Cache-Control': cacheControl, ETag: tile.etag, Vary: 'Accept-Encoding' };
  if (isFresh(request.headers.get('if-none-match'), tile.etag)) return new Response(null, { status: 304, headers });
  const gzipped = acceptsGzip(request.headers.get('accept-encoding'));
  const body = gzipped ? tile.gzipped : tile.raw;
  if (gzipped) headers['Content-Encoding'] = 'gzip';
  return new Response(new Uint8Array(body), {
    status: 200,
    headers: { ...headers, 'Content-Type': 'application/vnd.mapbox-vector-tile', 'Content-Length': String(body.length) },
  });
}

/**
 * Mapbox Vector Tile of the basemap (public), the masts (map:view; ?operator=&band=&tech=&status=,
 * which apply to the clusters of the low zooms too) or the measured signal hexagons (map:view;
 * ?operator=&band=; readings from customers' homes count only for roles that may see customers).
 * Finished tiles are cached per process under the layer's data version (tile-cache.ts), so any write
 * to masts, cells or the basemap, or a recomputation of the hexagons (which raise it) is seen by the
 * next request. X-Tile-Cache says whether this process had the tile already.
 */
export const GET = handler(async ({ locals, params, url, request }) => {
  const user = params.layer === 'masts' || params.layer === 'signal' ? requirePermission(locals, 'map:view') : null;
  const t = parseWith(TileParamsSchema, params);
  const db = getReadDb();
  const address = { z: t.z, x: t.x, y: t.y };
  let spec: TileSpec;
  let cacheControl: string;
  if (t.layer === 'signal') {
    const query = parseQuery(SignalTileQuerySchema, url);
    const filter = { ...query, withHomeReadings: can(user!.role, 'plans:view') };
    const variant = `${filter.withHomeReadings ? 'all' : 'survey'}&${filter.operatorId ?? ''}&${filter.band ?? ''}`;
    spec = { layer: 'signal', kind: 'signal', ...address, variant, query: (q) => signalTileQuery(q, address, filter) };
    cacheControl = CACHE_SIGNAL;
  } else if (t.layer === 'masts') {
    const filter = parseQuery(MastFilterSchema, url);
    spec = { layer: 'masts', kind: 'masts', ...address, variant: JSON.stringify(filter), query: (q) => mastsTileQuery(q, address, filter) };
    cacheControl = CACHE_MASTS;
  } else {
    spec = { layer: 'basemap', kind: 'basemap', ...address, variant: '', query: (q) => basemapTileQuery(q, address) };
    cacheControl = CACHE_BASEMAP;
  }
  const { tile, hit } = await getCachedTile(db, spec);
  const res = tileResponse(tile, cacheControl, request);
  res.headers.set('X-Tile-Cache', hit ? 'hit' : 'miss');
  return res;
});
