// Region figures: what lies inside a region's outline (masts, cells, readings, sightings, customers
// and their plans), counted by PostGIS. A point on the outline counts as inside (ST_Intersects).
import type { Knex } from 'knex';
import type { Tx } from '../db';
import { findRegion } from './regions';
import { MAST_STATUSES, TECHS, type Tech } from '../../schemas/mast-enums';
import {
  REGION_GAP_LIST_LIMIT,
  REGION_SIGHTING_LIST_LIMIT,
  type CoverageGapJson,
  type RegionSummaryJson,
  type SightingRefJson,
} from '../../schemas/region-summary';
import { PLAN_STATES, type PlanState } from '../../domain/plan-state';
import { COVERAGE_GAP_RULE, WEAK_BELOW_RSRP_DBM, gradePrediction } from '../../domain/coverage-gaps';

/** Who is asking: customers and readings taken at their homes only for roles that may see customers;
 * every sighting only for reviewers (others see decided ones and their own). */
export interface RegionViewer {
  userId: string;
  seesCustomers: boolean;
  seesAllSightings: boolean;
}

const REGION = 'WITH r AS (SELECT geom FROM regions WHERE id = ?)';
const MASTS_IN = `${REGION}, m AS (SELECT m.id, m.status FROM masts m, r WHERE ST_Intersects(m.geom, r.geom))`;
const CUSTOMERS_IN = `${REGION}, cu AS (SELECT c.id, c.name, c.address_label FROM customers c, r WHERE ST_Intersects(c.geom, r.geom))`;

/** A plan's prediction: the RSRP stored in its figures, when it is a number. */
const PREDICTION = `CASE WHEN jsonb_typeof(p.figures->'predicted_rsrp_dbm') = 'number' THEN (p.figures->>'predicted_rsrp_dbm')::float8 END`;

const techOrder = (t: string) => TECHS.indexOf(t as Tech);
const iso = (d: Date | null) => (d ? d.toISOString() : null);

async function rows<T>(db: Tx, sql: string, bindings: readonly Knex.RawBinding[]): Promise<T[]> {
  const res = await db.raw<{ rows: T[] }>(sql, bindings);
  return res.rows;
}

async function mastFigures(db: Tx, id: string) {
  const [byStatus, byOperator, byTech, byBand] = await Promise.all([
    rows<{ status: string; n: number }>(db, `${MASTS_IN} SELECT status, count(*)::int AS n FROM m GROUP BY status`, [id]),
    rows<{ id: string; name: string; colour: string; masts: number; cells: number }>(
      db,
      `${MASTS_IN} SELECT o.id, o.name, o.colour, count(DISTINCT c.mast_id)::int AS masts, count(*)::int AS cells
         FROM cells c JOIN m ON m.id = c.mast_id JOIN operators o ON o.id = c.operator_id
        GROUP BY o.id, o.name, o.colour ORDER BY cells DESC, o.name`,
      [id],
    ),
    rows<{ tech: Tech; masts: number; cells: number }>(
      db,
      `${MASTS_IN} SELECT c.tech, count(DISTINCT c.mast_id)::int AS masts, count(*)::int AS cells FROM cells c JOIN m ON m.id = c.mast_id GROUP BY c.tech`,
      [id],
    ),
    rows<{ tech: Tech; band: string; dl_mhz: number | null; masts: number; cells: number }>(
      db,
      `${MASTS_IN} SELECT c.tech, c.band, min(c.dl_mhz)::float8 AS dl_mhz, count(DISTINCT c.mast_id)::int AS masts, count(*)::int AS cells
         FROM cells c JOIN m ON m.id = c.mast_id GROUP BY c.tech, c.band ORDER BY min(c.dl_mhz) NULLS LAST, c.tech, c.band`,
      [id],
    ),
  ]);
  const statusCounts = Object.fromEntries(
    MAST_STATUSES.map((s) => [s, byStatus.find((r) => r.status === s)?.n ?? 0]),
  ) as RegionSummaryJson['masts']['by_status'];
  return {
    masts: { total: byStatus.reduce((sum, r) => sum + r.n, 0), by_status: statusCounts },
    cells: {
      total: byTech.reduce((sum, r) => sum + r.cells, 0),
      by_operator: byOperator.map((r) => ({ operator_id: String(r.id), name: r.name, colour: r.colour, masts: r.masts, cells: r.cells })),
      by_tech: byTech.sort((a, b) => techOrder(a.tech) - techOrder(b.tech)).map((r) => ({ tech: r.tech, masts: r.masts, cells: r.cells })),
      by_band: byBand.map((r) => ({ tech: r.tech, band: r.band, dl_mhz: r.dl_mhz, masts: r.masts, cells: r.cells })),
    },
  };
}

async function readingFigures(db: Tx, id: string, viewer: RegionViewer): Promise<RegionSummaryJson['readings']> {
  const homes = viewer.seesCustomers ? '' : 'AND x.install_check_id IS NULL';
  const byTech = await rows<{ tech: Tech; n: number; matched: number; first: Date | null; last: Date | null }>(
    db,
    `${REGION} SELECT x.tech, count(*)::int AS n, count(x.cell_id)::int AS matched, min(x.taken_at) AS first, max(x.taken_at) AS last
       FROM readings x, r WHERE ST_Intersects(x.geom, r.geom) ${homes} GROUP BY x.tech`,
    [id],
  );
  const firsts = byTech.map((r) => r.first).filter((d): d is Date => d !== null);
  const lasts = byTech.map((r) => r.last).filter((d): d is Date => d !== null);
  return {
    total: byTech.reduce((sum, r) => sum + r.n, 0),
    matched: byTech.reduce((sum, r) => sum + r.matched, 0),
    first_taken_at: firsts.length ? iso(new Date(Math.min(...firsts.map(Number)))) : null,
    last_taken_at: lasts.length ? iso(new Date(Math.max(...lasts.map(Number)))) : null,
    by_tech: byTech.sort((a, b) => techOrder(a.tech) - techOrder(b.tech)).map((r) => ({ tech: r.tech, count: r.n })),
    includes_install_checks: viewer.seesCustomers,
  };
}

async function sightingFigures(db: Tx, id: string, viewer: RegionViewer): Promise<RegionSummaryJson['sightings']> {
  const visible = viewer.seesAllSightings ? 'TRUE' : "(s.status IN ('approved', 'merged') OR s.author_id = ?)";
  const bindings = viewer.seesAllSightings ? [id] : [id, viewer.userId];
  const found = await rows<{
    id: string;
    status: SightingRefJson['status'];
    structure_type: string;
    observed_at: Date;
    lat: number;
    lon: number;
    mast_id: string | null;
    total: number;
  }>(
    db,
    `${REGION} SELECT s.id, s.status, s.structure_type, s.observed_at, ST_Y(s.geom::geometry) AS lat, ST_X(s.geom::geometry) AS lon, s.mast_id,
            count(*) OVER ()::int AS total
       FROM sightings s, r WHERE ST_Intersects(s.geom::geometry, r.geom) AND ${visible}
      ORDER BY s.observed_at DESC, s.id DESC LIMIT ${REGION_SIGHTING_LIST_LIMIT}`,
    bindings,
  );
  return {
    total: found[0]?.total ?? 0,
    newest: found.map((s) => ({
      id: String(s.id),
      status: s.status,
      structure_type: s.structure_type,
      observed_at: s.observed_at.toISOString(),
      lat: s.lat,
      lon: s.lon,
      mast_id: s.mast_id === null ? null : String(s.mast_id),
    })),
  };
}

async function customerFigures(db: Tx, id: string): Promise<NonNullable<RegionSummaryJson['customers']>> {
  const [[totals], byState, [gapCounts], gapRows] = await Promise.all([
    rows<{ total: number; without_plan: number; predicted: number }>(
      db,
      `${CUSTOMERS_IN} SELECT count(*)::int AS total,
              count(*) FILTER (WHERE NOT EXISTS (SELECT 1 FROM plans p WHERE p.customer_id = cu.id))::int AS without_plan,
              count(*) FILTER (WHERE EXISTS (SELECT 1 FROM plans p WHERE p.customer_id = cu.id AND ${PREDICTION} IS NOT NULL))::int AS predicted
         FROM cu`,
      [id],
    ),
    rows<{ state: PlanState; n: number }>(
      db,
      `${CUSTOMERS_IN} SELECT p.state, count(*)::int AS n FROM plans p JOIN cu ON cu.id = p.customer_id GROUP BY p.state`,
      [id],
    ),
    rows<{ n: number }>(
      db,
      `${CUSTOMERS_IN}, best AS (SELECT p.customer_id, max(${PREDICTION}) AS rsrp FROM plans p JOIN cu ON cu.id = p.customer_id GROUP BY p.customer_id)
       SELECT count(*)::int AS n FROM best WHERE rsrp < ?`,
      [id, WEAK_BELOW_RSRP_DBM],
    ),
    rows<{
      customer_id: string;
      name: string;
      address_label: string;
      plan_id: string;
      state: PlanState;
      rsrp: number;
      tech: string | null;
      band: string | null;
      mast_name: string | null;
      operator_name: string | null;
    }>(
      db,
      `${CUSTOMERS_IN}, best AS (
         SELECT DISTINCT ON (p.customer_id) p.customer_id, p.id AS plan_id, p.state, ${PREDICTION} AS rsrp,
                coalesce(c.tech, p.figures->>'tech') AS tech, coalesce(c.band, p.figures->>'band') AS band,
                coalesce(mm.name, p.figures->'mast'->>'name') AS mast_name, coalesce(o.name, p.figures->'operator'->>'name') AS operator_name
           FROM plans p JOIN cu ON cu.id = p.customer_id
           LEFT JOIN cells c ON c.id = p.cell_id LEFT JOIN masts mm ON mm.id = c.mast_id LEFT JOIN operators o ON o.id = c.operator_id
          WHERE ${PREDICTION} IS NOT NULL
          ORDER BY p.customer_id, ${PREDICTION} DESC, p.id)
       SELECT b.*, cu.name, cu.address_label FROM best b JOIN cu ON cu.id = b.customer_id
        WHERE b.rsrp < ? ORDER BY b.rsrp, b.customer_id LIMIT ${REGION_GAP_LIST_LIMIT}`,
      [id, WEAK_BELOW_RSRP_DBM],
    ),
  ]);
  const gaps: CoverageGapJson[] = gapRows.map((g) => ({
    customer_id: String(g.customer_id),
    customer_name: g.name,
    address_label: g.address_label,
    plan_id: String(g.plan_id),
    plan_state: g.state,
    predicted_rsrp_dbm: g.rsrp,
    grade: gradePrediction({ rsrpDbm: g.rsrp, tech: g.tech ?? 'lte' }),
    tech: g.tech,
    band: g.band,
    mast_name: g.mast_name,
    operator_name: g.operator_name,
  }));
  const total = totals?.total ?? 0;
  const predicted = totals?.predicted ?? 0;
  return {
    total,
    without_plan: totals?.without_plan ?? 0,
    plans_by_state: Object.fromEntries(PLAN_STATES.map((s) => [s, byState.find((r) => r.state === s)?.n ?? 0])) as Record<PlanState, number>,
    predicted,
    not_predicted: total - predicted,
    gap_rule: COVERAGE_GAP_RULE,
    weak_below_rsrp_dbm: WEAK_BELOW_RSRP_DBM,
    gap_total: gapCounts?.n ?? 0,
    gaps,
  };
}

/** The region's figures as the API returns them (404 when there is no such region). */
export async function getRegionSummary(db: Tx, id: string, viewer: RegionViewer): Promise<RegionSummaryJson> {
  const region = await findRegion(db, id, 0);
  const [radio, readings, sightings, customers] = await Promise.all([
    mastFigures(db, id),
    readingFigures(db, id, viewer),
    sightingFigures(db, id, viewer),
    viewer.seesCustomers ? customerFigures(db, id) : Promise.resolve(null),
  ]);
  return {
    region: { id: region.id, name: region.name, area_km2: region.areaKm2, bbox: region.bbox },
    ...radio,
    readings,
    sightings,
    customers,
  };
}
