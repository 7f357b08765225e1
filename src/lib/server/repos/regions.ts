// Regions: named areas (GeoJSON polygons) the team serves; geometry checked by PostGIS.
import type { Tx } from '../db';
import type { PolygonGeometry, RegionChange, RegionInput, RegionJson } from '../../schemas/regions';
import { ConflictError, NotFoundError, ValidationError } from '../errors';
import { recordAudit } from './audit';

export interface Region {
  id: string;
  name: string;
  geometry: RegionJson['geometry'];
  areaKm2: number;
  createdAt: Date;
  updatedAt: Date;
}

interface RegionRow {
  id: string;
  name: string;
  geometry: RegionJson['geometry'];
  area_km2: number;
  created_at: Date;
  updated_at: Date;
}

function toRegion(r: RegionRow): Region {
  return {
    id: String(r.id),
    name: r.name,
    geometry: r.geometry,
    areaKm2: Math.round(r.area_km2 * 100) / 100,
    createdAt: r.created_at,
    updatedAt: r.updated_at,
  };
}

export function regionJson(r: Region): RegionJson {
  return {
    id: r.id,
    name: r.name,
    geometry: r.geometry,
    area_km2: r.areaKm2,
    created_at: r.createdAt.toISOString(),
    updated_at: r.updatedAt.toISOString(),
  };
}

function selectRegions(db: Tx) {
  return db('regions').select(
    'id',
    'name',
    'created_at',
    'updated_at',
    db.raw('ST_AsGeoJSON(geom, 7)::json AS geometry'),
    db.raw('ST_Area(geom::geography) / 1e6 AS area_km2'),
  );
}

export async function listRegions(db: Tx): Promise<Region[]> {
  const rows: RegionRow[] = await selectRegions(db).orderBy('name');
  return rows.map(toRegion);
}

export async function findRegion(db: Tx, id: string): Promise<Region> {
  const row: RegionRow | undefined = await selectRegions(db).where({ id }).first();
  if (!row) throw new NotFoundError('Region not found');
  return toRegion(row);
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
