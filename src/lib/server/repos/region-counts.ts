// The regions page's key counts of every region: masts, cells, readings and customers inside each
// outline (a point on the outline counts as inside, ST_Intersects, as in region-summary.ts).
// Readings are counted from the signal map's hexagons (reading_hexes): a hexagon wholly inside the
// outline adds its stored count, and only the readings of hexagons across the outline are counted
// one by one (lib/domain/region-counting.ts chooses the level). Hexagons whose readings changed
// since the signal-hexes job last ran (reading_hex_dirty) are counted one by one too, so the figures
// are exact at any moment. Everything is read in one snapshot.
import type { Knex } from 'knex';
import type { Tx } from '../db';
import type { RegionCountsJson } from '../../schemas/region-summary';
import { getCountingLevel, getHexRangeForLonLatBox, listHexesInBoxes, type LonLatBox } from '../../domain/region-counting';
import type { HexLevel } from '../../domain/signal-map';
import { hexCellSql } from './reading-hexes';

/** Above this many hexagons with changes not yet binned, a region's readings are counted one by one. */
const MAX_CHANGED_HEXES = 5_000;

interface Plan {
  /** Regions counted from the hexagons: id, level, edge and the columns and rows that can hold their readings. */
  hexed: { id: string[]; level: number[]; size: number[]; iMin: number[]; iMax: number[]; jMin: number[]; jMax: number[] };
  /** Hexagons whose stored counts are out of date, by level. */
  changed: { level: number[]; i: number[]; j: number[] };
  /** Regions whose readings are counted one by one (too much changed around them). */
  direct: string[];
}

type BoxRow = { id: string; w: number | null; s: number | null; e: number | null; n: number | null };
const boxOf = (r: BoxRow): LonLatBox | null => (r.w === null ? null : [r.w, r.s!, r.e!, r.n!]);

async function planCounting(db: Tx): Promise<Plan> {
  const box = (g: string) => `ST_XMin(${g}) AS w, ST_YMin(${g}) AS s, ST_XMax(${g}) AS e, ST_YMax(${g}) AS n`;
  const regions = (await db.raw<{ rows: BoxRow[] }>(`SELECT id, ${box('geom')} FROM regions`)).rows;
  const dirty = (await db.raw<{ rows: BoxRow[] }>(`SELECT id, ${box('box')} FROM reading_hex_dirty`)).rows.map(boxOf);
  const plan: Plan = { hexed: { id: [], level: [], size: [], iMin: [], iMax: [], jMin: [], jMax: [] }, changed: { level: [], i: [], j: [] }, direct: [] };
  // A NULL box means everything changed (readings emptied).
  const changedAt = new Map<number, Array<{ i: number; j: number }> | null>();
  const changedHexes = (level: HexLevel) => {
    if (!changedAt.has(level.level)) {
      const hexes = dirty.some((b) => b === null) ? null : listHexesInBoxes(level, dirty as LonLatBox[], MAX_CHANGED_HEXES);
      changedAt.set(level.level, hexes);
      for (const h of hexes ?? []) {
        plan.changed.level.push(level.level);
        plan.changed.i.push(h.i);
        plan.changed.j.push(h.j);
      }
    }
    return changedAt.get(level.level);
  };
  for (const r of regions) {
    const level = getCountingLevel(boxOf(r)!);
    if (!changedHexes(level)) {
      plan.direct.push(String(r.id));
      continue;
    }
    const range = getHexRangeForLonLatBox(level, boxOf(r)!);
    plan.hexed.id.push(String(r.id));
    plan.hexed.level.push(level.level);
    plan.hexed.size.push(level.sizeM);
    plan.hexed.iMin.push(range.iMin);
    plan.hexed.iMax.push(range.iMax);
    plan.hexed.jMin.push(range.jMin);
    plan.hexed.jMax.push(range.jMax);
  }
  return plan;
}

/**
 * SQL giving `counts (id, readings)` for the hexed regions. A hexagon's box (its Web Mercator
 * bounding box, 1 m wider, as WGS84: exact, the projection keeps axis-parallel boxes) inside the outline
 * means every reading of the hexagon is; `max` over audiences takes 'all' (every reading) where a
 * hexagon has one.
 */
function hexCountsSql(homes: string): string {
  const rowY = (offset: string) => `sqrt(3.0::float8) * size * (j + (i & 1) * 0.5 ${offset}) `;
  return `v AS (SELECT * FROM unnest(?::bigint[], ?::int[], ?::float8[], ?::int[], ?::int[], ?::int[], ?::int[]) AS v(id, level, size, imin, imax, jmin, jmax)),
    changed AS (SELECT * FROM unnest(?::int[], ?::int[], ?::int[]) AS d(level, i, j)),
    hx AS (
      SELECT v.id, v.size, h.i, h.j, max(h.readings) AS readings
        FROM v JOIN reading_hexes h ON h.level = v.level AND h.i BETWEEN v.imin AND v.imax AND h.j BETWEEN v.jmin AND v.jmax
       WHERE h.operator_id IS NULL AND h.band IS NULL AND h.audience = ANY(?::text[])
       GROUP BY v.id, v.size, h.i, h.j
      UNION ALL
      SELECT v.id, v.size, d.i, d.j, NULL FROM v JOIN changed d ON d.level = v.level AND d.i BETWEEN v.imin AND v.imax AND d.j BETWEEN v.jmin AND v.jmax),
    hexes AS (
      SELECT id, size, i, j, CASE WHEN bool_and(readings IS NOT NULL) THEN max(readings) END AS readings,
             ST_Transform(ST_MakeEnvelope(1.5 * size * i - size - 1, ${rowY('- 0.5')} - 1, 1.5 * size * i + size + 1, ${rowY('+ 0.5')} + 1, 3857), 4326) AS box
        FROM hx GROUP BY id, size, i, j),
    counts AS (
      SELECT c.id, sum(CASE WHEN c.readings IS NOT NULL AND ST_Within(c.box, g.geom) THEN c.readings ELSE (
               SELECT count(*) FROM readings x ${hexCellSql('k', 'x.geom', 'c.size')}
                WHERE x.geom && c.box AND k.i = c.i AND k.j = c.j AND ST_Intersects(x.geom, g.geom) ${homes}) END) AS readings
        FROM hexes c JOIN regions g ON g.id = c.id
       WHERE c.box && g.geom
       GROUP BY c.id)`;
}

/** Every region with its key counts, by name. Readings at customers' homes and customers only for `seesCustomers`. */
export async function listRegionCounts(db: Tx, viewer: { seesCustomers: boolean }): Promise<RegionCountsJson[]> {
  // One snapshot: the hexagons, what changed since, and the readings agree.
  const read = (trx: Tx) => countRegions(trx, viewer);
  const found = db.isTransaction ? await read(db) : await (db as Knex).transaction(read, { isolationLevel: 'repeatable read', readOnly: true });
  return found.map((r) => ({
    id: String(r.id),
    name: r.name,
    area_km2: Math.round(r.area_km2 * 100) / 100,
    masts: r.masts,
    cells: r.cells,
    readings: r.readings,
    customers: r.customers,
  }));
}

async function countRegions(db: Tx, viewer: { seesCustomers: boolean }) {
  const plan = await planCounting(db);
  const homes = viewer.seesCustomers ? '' : 'AND x.install_check_id IS NULL';
  const customers = viewer.seesCustomers ? '(SELECT count(*) FROM customers cu WHERE ST_Intersects(cu.geom, g.geom))::int' : 'NULL::int';
  const h = plan.hexed;
  const res = await db.raw<{
    rows: Array<{ id: string; name: string; area_km2: number; masts: number; cells: number; readings: number; customers: number | null }>;
  }>(
    `WITH ${hexCountsSql(homes)}
     SELECT g.id, g.name, ST_Area(g.geom::geography) / 1e6 AS area_km2,
            (SELECT count(*) FROM masts m WHERE ST_Intersects(m.geom, g.geom))::int AS masts,
            (SELECT coalesce(sum(s.cell_count), 0) FROM mast_cell_summaries s JOIN masts m ON m.id = s.mast_id WHERE ST_Intersects(m.geom, g.geom))::int AS cells,
            (CASE WHEN g.id = ANY(?::bigint[]) THEN (SELECT count(*) FROM readings x WHERE ST_Intersects(x.geom, g.geom) ${homes})
                  ELSE coalesce(k.readings, 0) END)::int AS readings,
            ${customers} AS customers
       FROM regions g LEFT JOIN counts k ON k.id = g.id
      ORDER BY g.name, g.id`,
    [
      h.id,
      h.level,
      h.size,
      h.iMin,
      h.iMax,
      h.jMin,
      h.jMax,
      plan.changed.level,
      plan.changed.i,
      plan.changed.j,
      viewer.seesCustomers ? ['survey', 'all'] : ['survey'],
      plan.direct,
    ] as unknown as readonly Knex.RawBinding[],
  );
  return res.rows;
}
