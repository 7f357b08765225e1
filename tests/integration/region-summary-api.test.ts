import { beforeEach, describe, expect, it } from 'vitest';
import { GET as getSummary } from '../../src/pages/api/regions/[id]/summary';
import { listRegionCounts } from '../../src/lib/server/repos/region-counts';
import { RegionSummarySchema } from '../../src/lib/schemas/region-summary';
import { call } from '../helpers/endpoint';
import { testDb, truncateAll } from '../helpers/db';
import { asSessionUser, makeUser } from '../helpers/factories';
import { buildRegionFixture, type RegionFixture } from '../helpers/region-fixture';

const summary = (user: ReturnType<typeof asSessionUser> | null, id: string) => call(getSummary, { user, params: { id }, url: `/api/regions/${id}/summary` });

describe('region summary API', () => {
  let f: RegionFixture;
  let planner: ReturnType<typeof asSessionUser>;
  beforeEach(async () => {
    await truncateAll();
    f = await buildRegionFixture();
    planner = asSessionUser(await makeUser('planner'));
  });

  it('answers 401 signed out, 400 for a malformed id and 404 for a missing region, in the error shape', async () => {
    expect((await summary(null, f.region)).body).toEqual({ error: { code: 'UNAUTHORIZED', message: expect.any(String) } });
    const bad = await summary(planner, '01');
    expect(bad.status).toBe(400);
    expect(bad.body.error).toMatchObject({ code: 'BAD_REQUEST', fields: { id: [expect.any(String)] } });
    const missing = await summary(planner, '999999');
    expect(missing.status).toBe(404);
    expect(missing.body.error.code).toBe('NOT_FOUND');
  });

  it('counts masts and cells inside the outline by status, operator, technology and band', async () => {
    const res = await summary(planner, f.region);
    expect(res.status).toBe(200);
    const s = RegionSummarySchema.parse(res.body);
    expect(s.region).toMatchObject({ id: f.region, name: 'Test Square' });
    [-128.6, -47.3, -128.4, -47.1].forEach((v, i) => expect(s.region.bbox[i]).toBeCloseTo(v, 9));
    expect(s.masts).toEqual({ total: 2, by_status: { active: 1, planned: 1, decommissioned: 0 } });
    expect(s.cells.total).toBe(3);
    expect(s.cells.by_operator).toEqual([
      { operator_id: f.opA, name: 'Test Mobile A', colour: expect.any(String), masts: 2, cells: 2 },
      { operator_id: f.opB, name: 'Test Mobile B', colour: expect.any(String), masts: 1, cells: 1 },
    ]);
    expect(s.cells.by_tech).toEqual([
      { tech: 'lte', masts: 2, cells: 2 },
      { tech: 'nr', masts: 1, cells: 1 },
    ]);
    // Lowest downlink first: B20 806 MHz, B3 1815 MHz (TS 36.101 Table 5.7.3-1), n78 3619.2 MHz (TS 38.104).
    expect(s.cells.by_band.map((b) => [b.band, b.cells, b.masts])).toEqual([
      ['B20', 1, 1],
      ['B3', 1, 1],
      ['n78', 1, 1],
    ]);
    expect(s.cells.by_band[0]!.dl_mhz).toBeCloseTo(806, 3);
  });

  it('counts readings with their date range; readings at customers’ homes only for roles that may see customers', async () => {
    const forPlanner = RegionSummarySchema.parse((await summary(planner, f.region)).body);
    expect(forPlanner.readings).toEqual({
      total: 4,
      matched: 3,
      first_taken_at: '2026-11-01T08:00:00.000Z',
      last_taken_at: '2026-11-10T08:00:00.000Z',
      by_tech: [
        { tech: 'lte', count: 3 },
        { tech: 'nr', count: 1 },
      ],
      includes_install_checks: true,
    });
    const reviewer = asSessionUser(await makeUser('reviewer'));
    const forReviewer = RegionSummarySchema.parse((await summary(reviewer, f.region)).body);
    expect(forReviewer.readings).toMatchObject({ total: 3, matched: 2, last_taken_at: '2026-11-05T08:00:00.000Z', includes_install_checks: false });
  });

  it('lists the newest sightings inside: all for reviewers, decided ones and their own for others', async () => {
    const reviewer = asSessionUser(await makeUser('reviewer'));
    const all = RegionSummarySchema.parse((await summary(reviewer, f.region)).body).sightings;
    expect(all.total).toBe(3);
    expect(all.newest.map((x) => [x.status, x.observed_at.slice(0, 10)])).toEqual([
      ['pending', '2026-11-20'],
      ['rejected', '2026-11-19'],
      ['approved', '2026-11-18'],
    ]);
    expect(all.newest[2]!.mast_id).toBe(f.hill);
    const own = RegionSummarySchema.parse((await summary(asSessionUser(f.contributor), f.region)).body).sightings;
    expect(own.newest.map((x) => x.status)).toEqual(['pending', 'rejected', 'approved']);
    const other = RegionSummarySchema.parse((await summary(planner, f.region)).body).sightings;
    expect(other).toMatchObject({ total: 1, newest: [{ status: 'approved' }] });
  });

  it('gives customers, plans by state and coverage gaps (best prediction below −100 dBm) to roles that may see customers', async () => {
    const c = RegionSummarySchema.parse((await summary(planner, f.region)).body).customers;
    expect(c).toMatchObject({
      total: 4,
      without_plan: 1,
      plans_by_state: { enquiry: 2, planned: 1, scheduled: 1, installed: 0, verified: 0 },
      predicted: 2,
      not_predicted: 2,
      weak_below_rsrp_dbm: -100,
      gap_total: 1,
    });
    expect(c!.gap_rule).toMatch(/below -100 dBm/);
    // "Test Strong" has a −108 dBm plan too, but its best is −95: not a gap. "Test Away" is outside.
    expect(c!.gaps).toEqual([
      {
        customer_id: f.gapCustomer,
        customer_name: 'Test Gap',
        address_label: "Test Gap's farm",
        plan_id: f.gapPlan,
        plan_state: 'scheduled',
        predicted_rsrp_dbm: -112,
        // Below −110 dBm: unusable (installers' grades, common practice).
        grade: 'unusable',
        tech: 'lte',
        band: 'B20',
        mast_name: 'Test Hill',
        operator_name: 'Test Mobile A',
      },
    ]);
  });

  it.each(['reviewer', 'contributor'] as const)('leaves customers out for a %s', async (role) => {
    const user = asSessionUser(await makeUser(role));
    const res = await summary(user, f.region);
    expect(res.status).toBe(200);
    expect(res.body.customers).toBeNull();
    expect(JSON.stringify(res.body)).not.toContain('Test Gap');
  });

  it('gives an empty region zeros and empty lists', async () => {
    const s = RegionSummarySchema.parse((await summary(planner, f.emptyRegion)).body);
    expect(s.masts.total).toBe(0);
    expect(s.cells).toEqual({ total: 0, by_operator: [], by_tech: [], by_band: [] });
    expect(s.readings).toMatchObject({ total: 0, first_taken_at: null, last_taken_at: null, by_tech: [] });
    expect(s.sightings).toEqual({ total: 0, newest: [] });
    expect(s.customers).toMatchObject({ total: 0, gap_total: 0, gaps: [] });
  });

  it('lists every region with its key counts (customers only for roles that may see them)', async () => {
    expect(await listRegionCounts(testDb(), { seesCustomers: true })).toEqual([
      { id: f.emptyRegion, name: 'Empty Sea', area_km2: expect.any(Number), masts: 0, cells: 0, readings: 0, customers: 0 },
      { id: f.region, name: 'Test Square', area_km2: expect.any(Number), masts: 2, cells: 3, readings: 4, customers: 4 },
    ]);
    expect((await listRegionCounts(testDb(), { seesCustomers: false }))[1]).toMatchObject({ readings: 3, customers: null });
  });
});
