// Demo customers: a dozen invented households and farms at demo gazetteer addresses, with plans
// in every state. Plans past the enquiry stage aim at the top cell of the product's own
// shortlist for that address (terrain from the demo island's elevation function, the same
// surface seed 08 imports as a grid); their figures are the shortlist row the planner page
// would have saved. Installed and verified plans carry before/after checks recorded by the
// demo surveyor. Everything goes through the repos, so the audit trail reads like real use.
import type { Knex } from 'knex';
import { getDemoElevationM } from '../src/lib/demo';
import { createRandom, hashString } from '../src/lib/demo/random';
import { getDistanceM, listPointsAlong, type LatLon } from '../src/lib/domain/geodesy';
import type { ElevationProfile } from '../src/lib/domain/elevation-grid';
import type { PlanState } from '../src/lib/domain/plan-state';
import { createCustomer } from '../src/lib/server/repos/customers';
import { addInstallCheck, createPlan, updatePlan } from '../src/lib/server/repos/plans';
import { syncInstallReadings } from '../src/lib/server/repos/install-feedback';
import { buildShortlist, type ProfileProvider } from '../src/lib/server/shortlist-service';
import { shortlistJson } from '../src/lib/server/shortlist-json';

type Target = PlanState | null;

const CUSTOMERS: Array<{ name: string; target: Target; note: string | null }> = [
  { name: 'Hester Quillan', target: 'verified', note: 'Works from home; video calls drop in the evening.' },
  { name: 'Ansel Brackwater', target: 'verified', note: 'Dairy farm office and two cottages on one router.' },
  { name: 'Morwen Tilley', target: 'installed', note: 'Gable wall faces the hill; ladder access from the yard.' },
  { name: 'Edric Hollowmere', target: 'installed', note: null },
  { name: 'Perpetua Stainby', target: 'scheduled', note: 'Prefers morning visits. Dogs kept in the kitchen.' },
  { name: 'Cadoc Ferrand', target: 'scheduled', note: 'Holiday let: install between guests.' },
  { name: 'Isolde Varrow', target: 'planned', note: 'Asked for a quote first.' },
  { name: 'Tobiah Grennan', target: 'planned', note: null },
  { name: 'Wenna Cressing', target: 'planned', note: 'Chimney stack is the only high point; check its condition.' },
  { name: 'Lorcan Pellington', target: 'enquiry', note: 'Phoned in after a neighbour’s install.' },
  { name: 'Dilys Harrowby', target: 'enquiry', note: 'Wants to know if a roof antenna is needed at all.' },
  { name: 'Soren Quenby', target: null, note: 'New enquiry by e-mail; address to confirm.' },
  { name: 'Maelis Ashcombe', target: 'scheduled', note: 'Gate code at the road end; ring ahead.' },
];

/**
 * Customers who keep their operator (a contract, a work SIM) at a farm where that operator is weak
 * on every side: the best prediction with the plan's kit stays below the "fair" floor, so each
 * region lists a coverage gap. Addresses and operators of the demo gazetteer and network (seeds 02
 * and 06), chosen where the operator's best predicted RSRP with that kit is well below −100 dBm.
 */
const GAP_CUSTOMERS: Array<{ name: string; address: string; operator: string; note: string }> = [
  {
    name: 'Corwen Blackett',
    address: 'Kestrel Hill Farm, West Coast Road, Sallowcombe',
    operator: 'Orvane Mobile',
    note: 'Stays with Orvane Mobile (work phone); calls drop indoors.',
  },
  {
    name: 'Ysolde Marrable',
    address: 'Larch Howe, West Coast Road, Sallowcombe',
    operator: 'Quillfern Wireless',
    note: 'Quillfern Wireless contract until next year; chimney mount only.',
  },
  {
    name: 'Piran Stoddart',
    address: 'Lapwing Cottage, South Coast Road, Drumhallow',
    operator: 'Pellimore Networks',
    note: 'Farm SIM on Pellimore Networks; asked what the best aim can do.',
  },
];

// Past visits and check times are fixed so every run gives the same history; the booked visits
// still to come are set from the day the demo is loaded, so the schedule always has one past due,
// one this week (the loading day itself) and one later.
const SCHEDULED_FOR = ['2026-11-12', '2026-11-19', '2026-11-24', '2026-11-26'];
const BOOKED_DAYS_FROM_LOAD = [-3, 0, 9];

/** The UTC calendar day `days` after `from`, as YYYY-MM-DD. */
function dayAfter(from: Date, days: number): string {
  return new Date(Date.UTC(from.getUTCFullYear(), from.getUTCMonth(), from.getUTCDate() + days)).toISOString().slice(0, 10);
}
/** Dates a plan's last change of state to the visit, not to the day the demo is loaded. */
async function stateChangedOn(knex: Knex, planId: string, at: string): Promise<void> {
  await knex('plans')
    .where({ id: planId })
    .update({ state_changed_at: new Date(at) });
}
const SHORTLIST_DATE = new Date('2026-11-02T00:00:00Z');

/** Terrain profiles straight from the demo island's elevation function. */
const demoProfile: ProfileProvider = async (from: LatLon, to: LatLon, { maxSamples }) => {
  const points = listPointsAlong(from, to, Math.max(2, Math.min(maxSamples, 200))).map((p) => ({ ...p, groundM: getDemoElevationM(p.lat, p.lon) }));
  const distanceM = points[points.length - 1]!.distanceM;
  const profile: ElevationProfile = {
    points,
    distanceM,
    stepM: distanceM / (points.length - 1),
    gridSpacingM: null,
    gridIds: [],
    coverage: { sampleCount: points.length, coveredCount: points.length, fraction: 1, complete: true, firstMissingDistanceM: null, missingRanges: [] },
  };
  return profile;
};

const round1 = (v: number) => Math.round(v * 10) / 10;

export async function seed(knex: Knex): Promise<void> {
  await knex.raw('TRUNCATE customers, plans, install_checks, install_check_readings, install_check_speed_tests RESTART IDENTITY CASCADE');
  await knex('audit_log').whereIn('entity', ['customer', 'plan']).delete();
  // Readings fed back from the previous run's verified installs go with their checks.
  await knex('readings').whereNotNull('install_check_id').delete();

  const planner = await knex('users').where({ email: 'planner@demo.bearline.test' }).first('id');
  const surveyor = await knex('users').where({ email: 'surveyor@demo.bearline.test' }).first('id');
  if (!planner || !surveyor) throw new Error('seed 07 needs the demo users of seed 01');
  const plannerId = String(planner.id);
  const surveyorId = String(surveyor.id);
  const panel = await knex('antennas').where({ name: 'Panel 2×2 8 dBi' }).first('id');
  const stub = await knex('antennas').where({ kind: 'stub' }).first('id');
  const feeders = await knex('cables').orderBy('id').select('id', 'name');
  if (!panel || !stub || feeders.length === 0) throw new Error('seed 07 needs the demo catalogue of seed 05');
  const operators: { id: string }[] = await knex('operators').orderBy('id').select('id');

  /** The product's own shortlist for an address and kit, with terrain from the demo island. */
  const shortlistAt = async (
    at: LatLon,
    kit: { antennaId: string; cableId: string; cableM: number; mountHeightM: number },
    operator: { preferredOperatorId?: string; requiredOperatorId?: string },
  ) => {
    const where = { lat: at.lat, lon: at.lon };
    const result = await buildShortlist(
      knex,
      { at: where, heightM: kit.mountHeightM, ...kit, currentAntennaId: String(stub.id), ...operator, date: SHORTLIST_DATE },
      demoProfile,
    );
    return shortlistJson(result, where).items;
  };

  // Rural addresses (postcodes -9xxx) far from the nearest active mast — where outdoor antennas
  // are sold — at least 3 km apart, and two in town.
  const rural: Array<{ label: string; postcode: string; lat: number; lon: number }> = (
    await knex.raw(
      `SELECT a.label, a.postcode, ST_Y(a.geom) AS lat, ST_X(a.geom) AS lon
         FROM addresses a
         CROSS JOIN LATERAL (SELECT ST_Distance(a.geom::geography, m.geom::geography) AS d
                               FROM masts m WHERE m.status = 'active' ORDER BY m.geom <-> a.geom LIMIT 1) nearest
        WHERE a.postcode LIKE '%-9%'
        ORDER BY nearest.d DESC, a.id`,
    )
  ).rows;
  const town = await knex('addresses')
    .whereNot('postcode', 'like', '%-9%')
    .orderBy('id')
    .select('label', 'postcode', knex.raw('ST_Y(geom) AS lat'), knex.raw('ST_X(geom) AS lon'));
  const picked: typeof rural = [];
  for (const a of rural) {
    if (picked.length === 10) break;
    if (picked.every((p) => getDistanceM(p, a) >= 3000)) picked.push(a);
  }
  if (picked.length < 10 || town.length < 2) throw new Error('seed 07 needs the demo gazetteer of seed 06 and the masts of seed 02');
  const addresses = [...picked, town[7]!, town[Math.floor(town.length / 2)]!, town[Math.floor(town.length / 3)]!];

  const random = createRandom(hashString('bearline-customers'));
  const loadedOn = new Date();
  let scheduled = 0;
  for (const [i, c] of CUSTOMERS.entries()) {
    const at = addresses[i]!;
    const [first, last] = c.name.toLowerCase().split(' ');
    const operatorId = operators.length ? operators[i % operators.length]!.id : null;
    const customer = await createCustomer(
      knex,
      {
        name: c.name,
        phone: i % 4 === 3 ? null : `+00 ${random.int(100, 999)} ${random.int(100, 999)} ${random.int(1000, 9999)}`,
        email: i % 5 === 4 ? null : `${first}.${last}@example.test`,
        addressLabel: at.label,
        postcode: at.postcode,
        lat: at.lat,
        lon: at.lon,
        currentOperatorId: i === 11 ? null : String(operatorId),
        currentAntennaId: i === 11 ? null : String(stub.id),
        notes: c.note,
      },
      plannerId,
    );
    if (!c.target) continue;

    const cable = feeders[i % 3 === 0 ? feeders.length - 1 : Math.min(1, feeders.length - 1)]!;
    const kit = { antennaId: String(panel.id), cableId: String(cable.id), cableM: random.int(6, 18), mountHeightM: random.int(5, 9) };
    const items = await shortlistAt(at, kit, { preferredOperatorId: String(operatorId) });
    const chosen = items.find((e) => e.pci !== null);
    const isEnquiry = c.target === 'enquiry' || !chosen;
    const plan = await createPlan(
      knex,
      {
        customerId: customer.id,
        cellId: isEnquiry ? null : String(chosen!.cell_id),
        ...(isEnquiry && i % 2 === 0 ? { antennaId: null, cableId: null, cableM: null, mountHeightM: null } : kit),
        figures: isEnquiry ? {} : chosen!,
        scheduledFor: null,
        notes: isEnquiry ? null : `Aim at ${chosen!.mast.name}, ${chosen!.operator.name} ${chosen!.band} PCI ${chosen!.pci}.`,
        state: isEnquiry ? 'enquiry' : 'planned',
      },
      plannerId,
    );
    if (isEnquiry || c.target === 'planned') continue;

    const scheduledFor =
      scheduled < SCHEDULED_FOR.length ? SCHEDULED_FOR[scheduled]! : dayAfter(loadedOn, BOOKED_DAYS_FROM_LOAD[scheduled - SCHEDULED_FOR.length]!);
    scheduled++;
    await updatePlan(knex, plan.id, { state: 'scheduled', scheduledFor }, plannerId);
    if (c.target === 'scheduled') continue;

    // At the visit, on its booked day: readings with the router's own antenna, the install, readings
    // through the new kit.
    const day = scheduledFor;
    const neighbour = items.find((e) => e.pci !== null && (e.pci !== chosen!.pci || e.channel !== chosen!.channel));
    const expected = chosen!.expected_gain_db ?? 6;
    const beforeMain = Math.min(-50, Math.max(-135, round1(chosen!.predicted_rsrp_dbm - expected + random.normal(0, 2))));
    const beforeOther = neighbour ? Math.max(-140, round1(neighbour.predicted_rsrp_dbm - (neighbour.expected_gain_db ?? 6) + random.normal(0, 2))) : null;
    const reading = (pci: number | null, channel: number, rsrp: number, sinr: number) => ({
      pci: pci!,
      channel,
      rsrpDbm: Math.min(-44, Math.max(-140, rsrp)),
      rsrqDb: round1(Math.min(-3, -19 + (rsrp + 140) / 6)),
      sinrDb: round1(sinr),
    });
    await addInstallCheck(
      knex,
      plan.id,
      {
        phase: 'before',
        takenAt: new Date(`${day}T09:20:00Z`),
        notes: "Router's own antennas, on the upstairs window sill.",
        readings: [
          reading(chosen!.pci, chosen!.channel, beforeMain, random.range(-2, 4)),
          reading(chosen!.pci, chosen!.channel, round1(beforeMain + random.normal(0, 1)), random.range(-2, 4)),
          ...(neighbour && beforeOther !== null ? [reading(neighbour.pci, neighbour.channel, beforeOther, random.range(-5, 1))] : []),
        ],
        speedTests: [{ downMbps: round1(random.range(1.5, 6)), upMbps: round1(random.range(0.2, 1.2)), latencyMs: random.int(60, 140) }],
      },
      surveyorId,
      new Date(`${day}T09:20:00Z`),
    );
    await updatePlan(
      knex,
      plan.id,
      { state: 'installed', notes: `${plan.notes} Installed at ${kit.mountHeightM} m, ${kit.cableM} m of ${cable.name}.` },
      plannerId,
    );
    await stateChangedOn(knex, plan.id, `${day}T11:30:00Z`);
    if (c.name === 'Edric Hollowmere') continue; // after-install check still to come

    // One install beats the prediction, another falls short (a hedge in the way); the rest near it.
    const delta = i === 0 ? 2.5 : i === 1 ? -4 : random.normal(0, 1.5);
    const afterMain = round1(beforeMain + expected + delta);
    await addInstallCheck(
      knex,
      plan.id,
      {
        phase: 'after',
        takenAt: new Date(`${day}T12:05:00Z`),
        notes: i === 1 ? 'Hedge line in the path; customer will trim it in winter.' : 'Panel on the gable bracket, aimed by compass and fine-tuned on RSRP.',
        readings: [
          reading(chosen!.pci, chosen!.channel, afterMain, random.range(8, 16)),
          reading(chosen!.pci, chosen!.channel, round1(afterMain + random.normal(0, 1)), random.range(8, 16)),
          ...(neighbour && beforeOther !== null
            ? [reading(neighbour.pci, neighbour.channel, round1(beforeOther + random.normal(-3, 2)), random.range(-6, 0))]
            : []),
        ],
        speedTests: [
          { downMbps: round1(random.range(25, 60)), upMbps: round1(random.range(5, 15)), latencyMs: random.int(28, 45) },
          { downMbps: round1(random.range(25, 60)), upMbps: round1(random.range(5, 15)), latencyMs: random.int(28, 45) },
        ],
      },
      surveyorId,
      new Date(`${day}T12:05:00Z`),
    );
    if (c.target === 'verified') {
      await updatePlan(knex, plan.id, { state: 'verified' }, plannerId);
      await stateChangedOn(knex, plan.id, `${day}T12:30:00Z`);
      await syncInstallReadings(knex, plan.id);
    }
  }
  // Coverage gaps: the best this operator can do at the farm, planned with a chimney-height mount.
  for (const g of GAP_CUSTOMERS) {
    const at = await knex('addresses').where({ label: g.address }).first('label', 'postcode', knex.raw('ST_Y(geom) AS lat'), knex.raw('ST_X(geom) AS lon'));
    const operator = await knex('operators').where({ name: g.operator }).first('id');
    if (!at || !operator) throw new Error(`seed 07 needs ${g.address} (seed 06) and ${g.operator} (seed 02)`);
    const [first, last] = g.name.toLowerCase().split(' ');
    const customer = await createCustomer(
      knex,
      {
        name: g.name,
        phone: `+00 ${random.int(100, 999)} ${random.int(100, 999)} ${random.int(1000, 9999)}`,
        email: `${first}.${last}@example.test`,
        addressLabel: at.label,
        postcode: at.postcode,
        lat: at.lat,
        lon: at.lon,
        currentOperatorId: String(operator.id),
        currentAntennaId: String(stub.id),
        notes: g.note,
      },
      plannerId,
    );
    const kit = { antennaId: String(panel.id), cableId: String(feeders[0]!.id), cableM: 15, mountHeightM: 5 };
    const chosen = (await shortlistAt(at, kit, { requiredOperatorId: String(operator.id) })).find((e) => e.pci !== null);
    if (!chosen) throw new Error(`seed 07 found no ${g.operator} cell for ${g.address}`);
    await createPlan(
      knex,
      {
        customerId: customer.id,
        cellId: String(chosen.cell_id),
        ...kit,
        figures: chosen,
        scheduledFor: null,
        notes: `Best ${g.operator} cell: ${chosen.mast.name} ${chosen.band} PCI ${chosen.pci}, weak. Discuss another operator or a higher mast.`,
        state: 'planned',
      },
      plannerId,
    );
  }
}
