// Basemap features (land, water, roads, places, land cover): place search for fly-to.
// The tiles themselves are built in tiles.ts.
import type { Tx } from '../db';
import { escapeLike } from './masts';

export interface PlaceHit {
  id: string;
  name: string;
  kind: string;
  lat: number;
  lon: number;
}

/** Named places whose name contains the text or resembles it (trigram similarity); towns before hamlets. */
export async function searchPlaces(db: Tx, text: string, limit: number): Promise<PlaceHit[]> {
  const contains = `%${escapeLike(text)}%`;
  const prefix = `${escapeLike(text)}%`;
  const rows: Array<{ id: string; name: string; kind: string; lat: number; lon: number }> = await db('basemap_places')
    .select('id', 'name', 'kind', db.raw('ST_Y(geom) AS lat'), db.raw('ST_X(geom) AS lon'))
    .where((w) => w.whereILike('name', contains).orWhereRaw('name % ?', [text]))
    .orderByRaw('(name ILIKE ?) DESC', [prefix])
    .orderByRaw('similarity(name, ?) DESC', [text])
    .orderBy([{ column: 'rank' }, { column: 'name' }])
    .limit(limit);
  return rows.map((r) => ({ id: String(r.id), name: r.name, kind: r.kind, lat: r.lat, lon: r.lon }));
}
