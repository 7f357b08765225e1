// Regions: named areas (GeoJSON polygons) the team serves; geometry checked by PostGIS.
import type { Tx } from '../db';
import type { PolygonGeometry, Region, RegionChange, RegionInput, RegionJson } from '../../schemas/regions';
import { ConflictError, NotFoundError, ValidationError } from '../errors';
import { recordAudit } from './audit';
import { getPixelToleranceDeg } from '../../domain/region-outline';

export type { Region };

interface RegionRow {
  id: string;
  name: string;
  geometry: RegionJson['geometry'];
  west: number;
  south: number;
  east: number;
  north: number;
  vertex_count: number;
  area_km2: number;
  created_at: Date;
  updated_at: Date;
}

function toRegion(r: RegionRow, zoom: number | undefined): Region {
  return {
    id: String(r.id),
    name: r.name,
    geometry: r.geometry,
    simplifiedForZoom: zoom ?? null,
    bbox: [r.west, r.south, r.east, r.north],
    vertexCount: Number(r.vertex_count),
    areaKm2: Math.round(r.area_km2 * 100) / 100,
    createdAt: r.created_at,
    updatedAt: r.updated_at,
  };
}

/** Regions with their outline in full, or simplified to one pixel at `zoom` (topology kept, so
 * rings neither vanish into lines nor cross). */
function selectRegions(db: Tx, zoom: number | undefined) {
  const outline =
    zoom === undefined
      ? db.raw('ST_AsGeoJSON(geom, 7)::json AS geometry')
      : db.raw('ST_AsGeoJSON(ST_Multi(ST_SimplifyPreserveTopology(geom, ?)), 7)::json AS geometry', [getPixelToleranceDeg(zoom)]);
  return db('regions').select(
    'id',
    'name',
    'created_at',
    'updated_at',
    outline,
    db.raw('ST_XMin(geom) AS west, ST_YMin(geom) AS south, ST_XMax(geom) AS east, ST_YMax(geom) AS north'),
    db.raw('ST_NPoints(geom) AS vertex_count'),
    db.raw('ST_Area(geom::geography) / 1e6 AS area_km2'),
  );
}

/** Every region, outlines simplified for `zoom` (a list never carries full outlines). */
export async function listRegions(db: Tx, zoom: number): Promise<Region[]> {
  const rows: RegionRow[] = await selectRegions(db, zoom).orderBy('name');
  return rows.map((r) => toRegion(r, zoom));
}

export async function findRegion(db: Tx, id: string, zoom?: number): Promise<Region> {
  const row: RegionRow | undefined = await selectRegions(db, zoom).where({ id }).first();
  if (!row) throw new NotFoundError('Region not found');
  return toRegion(row, zoom);
}

function geometrySql(db: Tx, geometry: PolygonGeometry) {
  return db.raw('ST_Multi(ST_SetSRID(ST_GeomFromGeoJSON(?), 4326))', [JSON.stringify(geometry)]);
}

/** Rejects self-intersecting or otherwise invalid polygons with PostGIS's reason. */
async function assertValidGeometry(db: Tx, geometry: PolygonGeometry): Promise<void> {
  const { rows } = await db.raw<{ rows: Array<{ valid: boolean; reason: string }> }>(
    'SELECT ST_IsValid(g) AS valid, ST_IsValidReason(g) AS reason FROM (SELECT ST_SetSRID(ST_GeomFromGeoJSON(?), 4326) AS g) s',
    [JSON.stringify(geometry)],
  );
  if (!rows[0]?.valid) {
    throw new ValidationError('The polygon is not valid', { geometry: [`Invalid polygon: ${rows[0]?.reason ?? 'unknown reason'}`] });
  }
}

async function assertNameFree(db: Tx, name: string, exceptId?: string): Promise<void> {
  const q = db('regions').whereRaw('lower(name) = lower(?)', [name]);
  if (exceptId) q.whereNot('id', exceptId);
  if (await q.first('id')) throw new ConflictError(`A region called ${name} already exists`);
}

export async function createRegion(db: Tx, input: RegionInput, actorId: string | null): Promise<Region> {
  await assertValidGeometry(db, input.geometry);
  await assertNameFree(db, input.name);
  const [row] = await db('regions')
    .insert({ name: input.name, geom: geometrySql(db, input.geometry) })
    .returning('id');
  const region = await findRegion(db, String(row.id));
  await recordAudit(db, { userId: actorId, action: 'create', entity: 'region', entityId: region.id, after: auditView(region) });
  return region;
}

export async function updateRegion(db: Tx, id: string, change: RegionChange, actorId: string): Promise<Region> {
  const before = await findRegion(db, id);
  const patch: Record<string, unknown> = { updated_at: db.fn.now() };
  if (change.name !== undefined) {
    await assertNameFree(db, change.name, id);
    patch.name = change.name;
  }
  if (change.geometry !== undefined) {
    await assertValidGeometry(db, change.geometry);
    patch.geom = geometrySql(db, change.geometry);
  }
  await db('regions').where({ id }).update(patch);
  const after = await findRegion(db, id);
  await recordAudit(db, { userId: actorId, action: 'update', entity: 'region', entityId: id, before: auditView(before), after: auditView(after) });
  return after;
}

export async function deleteRegion(db: Tx, id: string, actorId: string): Promise<void> {
  const before = await findRegion(db, id);
  await db('regions').where({ id }).delete();
  await recordAudit(db, { userId: actorId, action: 'delete', entity: 'region', entityId: id, before: auditView(before) });
}

function auditView(r: Region) {
  return { name: r.name, area_km2: r.areaKm2, geometry: r.geometry };
}
