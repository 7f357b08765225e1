import { beforeAll, describe, expect, it } from 'vitest';
import { seed as seedUsers } from '../../seeds/01_demo_users';
import { seed as seedMap } from '../../seeds/02_demo_map';
import { seed as seedCatalogue } from '../../seeds/05_demo_catalogue';
import { seed as seedAddresses } from '../../seeds/06_demo_addresses';
import { seed as seedCustomers } from '../../seeds/07_demo_customers';
import { findPlanDetail } from '../../src/lib/server/repos/plans';
import { createGazetteerGeocoder } from '../../src/lib/server/geocoder';
import { testDb, truncateAll } from '../helpers/db';

async function runSeeds() {
  const db = testDb();
  // As scripts/lib/seed-runner.ts runs them: in name order, each in its own transaction.
  for (const s of [seedUsers, seedMap, seedCatalogue, seedAddresses, seedCustomers]) await db.transaction((trx) => s(trx));
}

const snapshot = async () => ({
  addresses: await testDb()('addresses').orderBy('id').select('label', 'postcode', testDb().raw('ST_AsText(geom) AS at')),
  customers: await testDb()('customers').orderBy('id').select('name', 'address_label', 'phone', 'email'),
  plans: await testDb()('plans').orderBy('id').select('customer_id', 'cell_id', 'state', 'cable_m', 'mount_height_m', 'figures', 'scheduled_for'),
  readings: await testDb()('install_check_readings').orderBy('id').select('pci', 'channel', 'rsrp_dbm'),
});

describe('demo catalogue, gazetteer and customers', () => {
  beforeAll(async () => {
    await truncateAll();
    await runSeeds();
  }, 180_000);

  it('loads the generic catalogue with common-practice values', async () => {
    const antennas = await testDb()('antennas').orderBy('id');
    expect(antennas.map((a) => a.kind)).toEqual(['directional', 'directional', 'omni', 'stub']);
    const panel = antennas[0];
    expect(panel.horizontal_beamwidth_deg).toBe(40);
    for (const row of panel.gain_table) {
      expect(row.gain_dbi).toBeGreaterThanOrEqual(7);
      expect(row.gain_dbi).toBeLessThanOrEqual(9);
    }
    const cables = await testDb()('cables').orderBy('id');
    // LL-10 class at 2600 MHz: 0.23 dB/m (REFERENCE_CABLE_LOSS, a fitted estimate, ±20 %).
    expect(cables.find((c) => c.name === 'Feeder 10 mm low-loss').loss_table).toContainEqual({ freq_mhz: 2600, loss_db_per_m: 0.23 });
  });

  it('places a few hundred invented addresses on the island with postcodes of our own format', async () => {
    const rows = await testDb()('addresses').select('postcode', testDb().raw('ST_Y(geom) AS lat'), testDb().raw('ST_X(geom) AS lon'));
    expect(rows.length).toBeGreaterThanOrEqual(300);
    expect(rows.length).toBeLessThanOrEqual(600);
    for (const r of rows) expect(r.postcode).toMatch(/^[A-Z]{3}-\d{4}$/);
    const bounds = await testDb()('basemap_land').first(
      testDb().raw('ST_XMin(ST_Extent(geom)) AS w, ST_XMax(ST_Extent(geom)) AS e, ST_YMin(ST_Extent(geom)) AS s, ST_YMax(ST_Extent(geom)) AS n'),
    );
    for (const r of rows) {
      expect(r.lon).toBeGreaterThan(bounds.w);
      expect(r.lon).toBeLessThan(bounds.e);
      expect(r.lat).toBeGreaterThan(bounds.s);
      expect(r.lat).toBeLessThan(bounds.n);
    }
  });

  it('finds a seeded farm by name and by postcode', async () => {
    const farm = await testDb()('addresses').where('postcode', 'like', '%-9%').orderBy('id').first('label', 'postcode');
    const geocoder = createGazetteerGeocoder(testDb());
    expect((await geocoder.search(farm.label.split(',')[0], 5)).map((m) => m.label)).toContain(farm.label);
    expect((await geocoder.search(farm.postcode.toLowerCase(), 5))[0]).toMatchObject({ label: farm.label, score: 1 });
  });

  it('gives sixteen customers plans in every state (three of them coverage gaps), each past enquiry aimed at a shortlisted cell', async () => {
    expect(await testDb()('customers').count('* as n').first()).toEqual({ n: '16' });
    const states = await testDb()('plans').groupBy('state').select('state', testDb().raw('count(*)::int AS n'));
    expect(Object.fromEntries(states.map((s) => [s.state, s.n]))).toEqual({ enquiry: 2, planned: 6, scheduled: 3, installed: 2, verified: 2 });
    const aimed = await testDb()('plans').whereNot('state', 'enquiry');
    for (const p of aimed) {
      expect(p.cell_id).not.toBeNull();
      expect(p.figures).toMatchObject({ cell_id: String(p.cell_id), predicted_rsrp_dbm: expect.any(Number), bearing_true_deg: expect.any(Number) });
      expect(p.figures.distance_m).toBeLessThan(35_000);
    }
    expect((await testDb()('audit_log').where({ entity: 'plan', action: 'state' })).length).toBeGreaterThan(0);
  });

  it('records before/after checks so verified plans show measured against predicted gain', async () => {
    const verified = await testDb()('plans').where({ state: 'verified' }).orderBy('id');
    for (const p of verified) {
      const detail = await findPlanDetail(testDb(), String(p.id));
      const planned = detail.result.gains[0]!;
      expect(planned.pci).toBe(detail.cell!.pci);
      expect(planned.measuredGainDb).not.toBeNull();
      expect(planned.predictedGainDb).not.toBeNull();
      expect(detail.result.speedAfter.downMbps!).toBeGreaterThan(detail.result.speedBefore.downMbps!);
    }
  });

  it('is the same on every run', async () => {
    const first = await snapshot();
    await testDb().transaction((trx) => seedCatalogue(trx));
    await testDb().transaction((trx) => seedAddresses(trx));
    await testDb().transaction((trx) => seedCustomers(trx));
    expect(await snapshot()).toEqual(first);
  }, 120_000);
});
