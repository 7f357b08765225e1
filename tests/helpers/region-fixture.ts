// A region with known contents, for the region summary and the exports: a 0.2° square in open sea
// near the demo island, with masts, cells, readings, sightings, customers and plans inside and
// outside it. Every count the tests expect follows from the rows below.
import { createOperator } from '../../src/lib/server/repos/operators';
import { createMast } from '../../src/lib/server/repos/masts';
import { createCell } from '../../src/lib/server/repos/cells';
import { createRegion } from '../../src/lib/server/repos/regions';
import { CellInputSchema, MastInputSchema } from '../../src/lib/schemas/masts';
import type { User } from '../../src/lib/server/repos/users';
import { testDb } from './db';
import { makeUser } from './factories';
import { square } from './geojson';

export interface RegionFixture {
  region: string;
  emptyRegion: string;
  opA: string;
  opB: string;
  hill: string;
  planned: string;
  outside: string;
  hillB20: string;
  hillN78: string;
  plannedB3: string;
  outsideB20: string;
  contributor: User;
  surveyor: User;
  gapCustomer: string;
  gapPlan: string;
}

/** Square lon −128.6…−128.4, lat −47.3…−47.1 (counter-clockwise, RFC 7946 §3.1.6). */
export const FIXTURE_SQUARE = square(-128.6, -47.3, 0.2);

async function reading(values: {
  at: string;
  lat: number;
  lon: number;
  tech?: string;
  channel?: number;
  pci?: number;
  rsrp?: number;
  cell?: string | null;
  installCheck?: number;
}) {
  await testDb()('readings').insert({
    taken_at: values.at,
    geom: testDb().raw('ST_SetSRID(ST_MakePoint(?, ?), 4326)', [values.lon, values.lat]),
    tech: values.tech ?? 'lte',
    channel: values.channel ?? 6300,
    pci: values.pci ?? 101,
    rsrp_dbm: values.rsrp ?? -90,
    rsrq_db: -11,
    sinr_db: 8,
    cell_id: values.cell ?? null,
    device: 'Test phone',
    source: values.installCheck ? 'install_check' : 'survey',
    install_check_id: values.installCheck ?? null,
  });
}

async function sighting(authorId: string, values: { status: 'pending' | 'approved' | 'rejected'; lat: number; lon: number; at: string; mast?: string }) {
  await testDb()('sightings').insert({
    client_uuid: crypto.randomUUID(),
    author_id: authorId,
    status: values.status,
    geom: testDb().raw('ST_SetSRID(ST_MakePoint(?, ?), 4326)::geography', [values.lon, values.lat]),
    position_source: 'map',
    structure_type: 'monopole',
    observed_at: values.at,
    decided_at: values.status === 'pending' ? null : values.at,
    decision_reason: values.status === 'rejected' ? 'Not a mast' : null,
    mast_id: values.mast ?? null,
  });
}

async function customer(name: string, lat: number, lon: number): Promise<string> {
  const [row] = await testDb()('customers')
    .insert({ name, address_label: `${name}'s farm`, geom: testDb().raw('ST_SetSRID(ST_MakePoint(?, ?), 4326)', [lon, lat]) })
    .returning('id');
  return String(row.id);
}

async function plan(customerId: string, state: string, predictedRsrpDbm: number | null, cellId: string | null = null): Promise<string> {
  const figures = predictedRsrpDbm === null ? {} : { predicted_rsrp_dbm: predictedRsrpDbm, tech: 'lte', band: 'B20', grade: 'fair' };
  const [row] = await testDb()('plans').insert({ customer_id: customerId, state, figures, cell_id: cellId }).returning('id');
  return String(row.id);
}

export async function buildRegionFixture(): Promise<RegionFixture> {
  const db = testDb();
  const region = (await createRegion(db, { name: 'Test Square', geometry: FIXTURE_SQUARE }, null)).id;
  const emptyRegion = (await createRegion(db, { name: 'Empty Sea', geometry: square(170, -40, 0.1) }, null)).id;
  const opA = (await createOperator(db, { name: 'Test Mobile A', mcc: '001', mnc: '01' }, null)).id;
  const opB = (await createOperator(db, { name: 'Test Mobile B', mcc: '001', mnc: '02' }, null)).id;
  const mast = async (body: Record<string, unknown>) => (await createMast(db, MastInputSchema.parse(body), null)).id;
  const cell = async (mastId: string, body: Record<string, unknown>) => (await createCell(db, mastId, CellInputSchema.parse(body), null)).id;
  const hill = await mast({ name: 'Test Hill', reference: 'TST-001', lat: -47.2, lon: -128.5, structure_type: 'lattice_tower' });
  const planned = await mast({ name: 'Test Planned', lat: -47.25, lon: -128.55, status: 'planned' });
  // 0.1° east of the square's edge.
  const outside = await mast({ name: 'Test Outside', lat: -47.2, lon: -128.3, status: 'decommissioned' });
  // 3GPP TS 36.101 Table 5.7.3-1: EARFCN 6300 is B20 (806 MHz), 1300 is B3 (1815 MHz); TS 38.104: NR-ARFCN 641280 is n78 (3619.2 MHz).
  const hillB20 = await cell(hill, { operator_id: opA, tech: 'lte', channel: 6300, pci: 101, sector_azimuth_deg: 0 });
  const hillN78 = await cell(hill, { operator_id: opB, tech: 'nr', band: 'n78', channel: 641280, pci: 900, sector_azimuth_deg: 120 });
  const plannedB3 = await cell(planned, { operator_id: opA, tech: 'lte', channel: 1300, pci: 5 });
  const outsideB20 = await cell(outside, { operator_id: opA, tech: 'lte', channel: 6300, pci: 7 });

  // Readings: three surveyed inside (two matched to Hill B20), one at a customer's home inside
  // (an install check), one outside.
  await reading({ at: '2026-11-01T08:00:00Z', lat: -47.21, lon: -128.51, cell: hillB20, rsrp: -85 });
  await reading({ at: '2026-11-03T08:00:00Z', lat: -47.22, lon: -128.52, cell: hillB20, rsrp: -95 });
  await reading({ at: '2026-11-05T08:00:00Z', lat: -47.23, lon: -128.45, tech: 'nr', channel: 641280, pci: 901, rsrp: -104 });
  await reading({ at: '2026-11-10T08:00:00Z', lat: -47.24, lon: -128.53, cell: hillB20, rsrp: -99, installCheck: 424242 });
  await reading({ at: '2026-10-01T08:00:00Z', lat: -47.2, lon: -128.31, cell: outsideB20, rsrp: -80 });

  const contributor = await makeUser('contributor');
  const surveyor = await makeUser('surveyor');
  await sighting(contributor.id, { status: 'pending', lat: -47.15, lon: -128.45, at: '2026-11-20T10:00:00Z' });
  await sighting(surveyor.id, { status: 'approved', lat: -47.2, lon: -128.5, at: '2026-11-18T10:00:00Z', mast: hill });
  await sighting(contributor.id, { status: 'rejected', lat: -47.16, lon: -128.46, at: '2026-11-19T10:00:00Z' });
  await sighting(surveyor.id, { status: 'approved', lat: -47.2, lon: -128.3, at: '2026-11-21T10:00:00Z', mast: outside });

  // Customers: strong (best of two plans −95 dBm), gap (−112 dBm), not yet predicted, without a
  // plan, and one outside with a weak prediction.
  const strong = await customer('Test Strong', -47.22, -128.48);
  await plan(strong, 'planned', -108, hillB20);
  await plan(strong, 'enquiry', -95);
  const gapCustomer = await customer('Test Gap', -47.28, -128.58);
  const gapPlan = await plan(gapCustomer, 'scheduled', -112, hillB20);
  const waiting = await customer('Test Waiting', -47.12, -128.42);
  await plan(waiting, 'enquiry', null);
  await customer('Test Planless', -47.15, -128.55);
  const away = await customer('Test Away', -47.2, -128.2);
  await plan(away, 'planned', -120);

  return { region, emptyRegion, opA, opB, hill, planned, outside, hillB20, hillN78, plannedB3, outsideB20, contributor, surveyor, gapCustomer, gapPlan };
}
