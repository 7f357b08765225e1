// Regions: named polygons, imported as GeoJSON (RFC 7946). Shape checks here; the database checks
// validity (self-intersections and the like) with ST_IsValid.
import { z } from 'zod';
import { intParam, requiredText } from './params';
import { DEFAULT_OUTLINE_ZOOM, MAX_OUTLINE_ZOOM, MAX_REGION_VERTICES, countVertices } from '../domain/region-outline';

/** Largest region request body: room for MAX_REGION_VERTICES positions written out in full
 * (about 40 bytes each), refused while it streams in beyond that. */
export const REGION_BODY_MAX_BYTES = 4 * 1024 * 1024;

const position = z
  .array(z.number({ invalid_type_error: 'Coordinates must be numbers' }).finite(), { invalid_type_error: 'A position is [lon, lat]' })
  .min(2, 'A position is [lon, lat]')
  .max(3, 'A position is [lon, lat] or [lon, lat, height]')
  .superRefine((p, ctx) => {
    if (p[0]! < -180 || p[0]! > 180) ctx.addIssue({ code: 'custom', message: `Longitude ${p[0]} is outside −180…180` });
    if (p[1]! < -90 || p[1]! > 90) ctx.addIssue({ code: 'custom', message: `Latitude ${p[1]} is outside −90…90` });
  })
  // A height (third value, RFC 7946 §3.1.1) is allowed in the file but not kept: regions are 2D.
  .transform((p): [number, number] => [p[0]!, p[1]!]);

function lonSpan(ring: readonly (readonly number[])[]): number {
  let min = Infinity;
  let max = -Infinity;
  for (const p of ring) {
    min = Math.min(min, p[0]!);
    max = Math.max(max, p[0]!);
  }
  return ring.length ? max - min : 0;
}

const ring = z
  .array(position, { invalid_type_error: 'A ring is a list of positions' })
  .min(4, 'A ring needs at least four positions')
  .max(100_000, 'At most 100000 positions per ring')
  .refine((r) => r.length < 4 || (r[0]![0] === r[r.length - 1]![0] && r[0]![1] === r[r.length - 1]![1]), {
    message: 'A ring must end where it starts',
  })
  // RFC 7946 §3.1.9: a shape crossing 180° must be cut in two there; a ring spanning more than
  // half the globe is almost always one drawn the wrong way round the antimeridian.
  .refine((r) => lonSpan(r) <= 180, {
    message: 'The ring spans more than 180° of longitude: cut a region that crosses the antimeridian into two polygons',
  });

const polygonCoords = z.array(ring, { invalid_type_error: 'A polygon is a list of rings' }).min(1, 'A polygon needs an outer ring');

const PolygonSchema = z.object({ type: z.literal('Polygon'), coordinates: polygonCoords });
const MultiPolygonSchema = z.object({
  type: z.literal('MultiPolygon'),
  coordinates: z.array(polygonCoords).min(1, 'A multipolygon needs at least one polygon'),
});

export type PolygonGeometry = z.output<typeof PolygonSchema> | z.output<typeof MultiPolygonSchema>;

const GeometrySchema = z
  .discriminatedUnion('type', [PolygonSchema, MultiPolygonSchema], {
    errorMap: (issue, ctx) =>
      issue.code === 'invalid_union_discriminator'
        ? { message: 'Give a GeoJSON Polygon or MultiPolygon (or a Feature with one)' }
        : { message: ctx.defaultError },
  })
  .superRefine((g, ctx) => {
    const n = countVertices(g);
    if (n > MAX_REGION_VERTICES) {
      ctx.addIssue({ code: 'custom', message: `The outline has ${n} vertices; at most ${MAX_REGION_VERTICES} (simplify it first)` });
    }
  });

/** A Polygon or MultiPolygon, bare or wrapped in a Feature. */
export const RegionGeometrySchema = z.preprocess(
  (v) => (v && typeof v === 'object' && (v as { type?: unknown }).type === 'Feature' ? (v as { geometry?: unknown }).geometry : v),
  GeometrySchema,
);

const name = requiredText(80);

export const RegionInputSchema = z.object({ name, geometry: RegionGeometrySchema });
export type RegionInput = z.output<typeof RegionInputSchema>;

export const RegionChangeSchema = z
  .object({ name: name.optional(), geometry: RegionGeometrySchema.optional() })
  .refine((v) => v.name !== undefined || v.geometry !== undefined, { message: 'Nothing to change' });
export type RegionChange = z.output<typeof RegionChangeSchema>;

/** `?zoom=`: the outline simplified to one pixel at that zoom (lists default to zoom 8; one region
 * without `zoom` comes in full). */
export const RegionOutlineQuerySchema = z.object({ zoom: intParam('Zoom', 0, MAX_OUTLINE_ZOOM, -1).transform((z) => (z < 0 ? undefined : z)) });
export const RegionListQuerySchema = z.object({ zoom: intParam('Zoom', 0, MAX_OUTLINE_ZOOM, DEFAULT_OUTLINE_ZOOM) });

export interface RegionJson {
  id: string;
  name: string;
  /** The outline: simplified to `simplified_for_zoom` when that is set, else in full. */
  geometry: { type: 'MultiPolygon'; coordinates: number[][][][] };
  simplified_for_zoom: number | null;
  /** Of the full outline: [west, south, east, north] and its number of vertices. */
  bbox: [number, number, number, number];
  vertex_count: number;
  area_km2: number;
  created_at: string;
  updated_at: string;
}

/** A region as repos return it. */
export interface Region {
  id: string;
  name: string;
  geometry: RegionJson['geometry'];
  simplifiedForZoom: number | null;
  bbox: RegionJson['bbox'];
  vertexCount: number;
  areaKm2: number;
  createdAt: Date;
  updatedAt: Date;
}

export function regionJson(r: Region): RegionJson {
  return {
    id: r.id,
    name: r.name,
    geometry: r.geometry,
    simplified_for_zoom: r.simplifiedForZoom,
    bbox: r.bbox,
    vertex_count: r.vertexCount,
    area_km2: r.areaKm2,
    created_at: r.createdAt.toISOString(),
    updated_at: r.updatedAt.toISOString(),
  };
}
