/**
 * How big a region may be and how much of it the map needs. A region is drawn as an outline: at a
 * given zoom nothing finer than one screen pixel can be seen, so the outline is simplified to that
 * size before it is sent.
 */

/** Most vertices one region may have, all rings together (a detailed county boundary has a few
 * thousand; the cap keeps an import, the database and the map responsive). */
export const MAX_REGION_VERTICES = 50_000;

/** Tile size in pixels of the web map (256 px tiles, the OGC / Web Mercator scheme, common practice). */
const TILE_PX = 256;

/** Zoom the map asks for when it has no better idea (a whole region on screen). */
export const DEFAULT_OUTLINE_ZOOM = 8;
export const MAX_OUTLINE_ZOOM = 22;

/**
 * Longitude degrees covered by one pixel at a zoom, used as the simplification tolerance (at the
 * equator; nearer the poles a pixel covers fewer degrees of latitude, so this errs on the fine side
 * only in longitude and the outline stays within about a pixel everywhere the map is usable).
 */
export function getPixelToleranceDeg(zoom: number): number {
  return 360 / (TILE_PX * 2 ** zoom);
}

/** Vertices of a Polygon or MultiPolygon's coordinates, every ring counted with its closing position. */
export function countVertices(geometry: { type: string; coordinates: unknown }): number {
  const polygons = (geometry.type === 'Polygon' ? [geometry.coordinates] : geometry.coordinates) as unknown[][][];
  let n = 0;
  for (const polygon of polygons) for (const ring of polygon) n += ring.length;
  return n;
}
