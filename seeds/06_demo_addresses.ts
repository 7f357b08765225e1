// Demo gazetteer: a few hundred invented addresses on the demo island — numbered houses on
// invented streets in each settlement, and farms and cottages set back from the named roads
// between them. Postcodes use a format of our own: a three-letter district taken from the
// nearest settlement's name, a dash and four digits (9xxx for rural addresses), e.g. KLV-1013.
// Deterministic: the same island, roads and addresses on every run.
import type { Knex } from 'knex';
import { DEMO_SEED, createIslandModel, generateDemoScenario, isOnLand, toGeo, toLocal } from '../src/lib/demo';
import { createRandom, hashString, type Random } from '../src/lib/demo/random';

interface LocalPoint {
  x: number;
  y: number;
}

export interface DemoAddress {
  label: string;
  postcode: string;
  lat: number;
  lon: number;
}

const STREETS = [
  'Quay Row',
  'Chapel Street',
  'Mill Lane',
  'School Hill',
  'Orchard Close',
  'Kiln Walk',
  'Netherby Terrace',
  'Harbour Street',
  'Ropewalk',
  'Smithy Lane',
  'Church Brow',
  'Well Street',
  'Marsh Road',
  'Garden Row',
  'Bank Top',
  'Fold Lane',
  'Green Side',
  'Tanyard',
  'Weaver Street',
  'Brig End',
  'Wester Row',
  'Easter Row',
  'Cross Street',
  'Pinfold',
  'Stable Yard',
  'Chandler Row',
  'Salt Lane',
  'Bakehouse Lane',
  'Beacon View',
];
const FARM_FIRST = [
  'Alder',
  'Rowan',
  'Heather',
  'Bracken',
  'Curlew',
  'Lapwing',
  'Thorn',
  'Hazel',
  'Birch',
  'Larch',
  'Gorse',
  'Sedge',
  'Wren',
  'Plover',
  'Ling',
  'Fern',
  'Cairn',
  'Nether',
  'Upper',
  'Long',
  'Black',
  'Grey',
  'Stony',
  'Windy',
  'Whin',
  'Rush',
  'Peat',
  'Tarn',
  'Crag',
  'Heron',
  'Otter',
  'Ewe',
  'Crow',
  'Kestrel',
  'Sorrel',
];
const FARM_LAST = ['Farm', 'Cottage', 'Croft', 'Barn', 'House', 'Steading', 'Lodge', 'Byre', 'Fold', 'Garth', 'Hill Farm', 'Side', 'Head', 'Howe'];

const SETTLEMENT = {
  town: { streets: 6, houses: [8, 14], radiusKm: 0.7, clearKm: 1.2 },
  village: { streets: 3, houses: [5, 9], radiusKm: 0.4, clearKm: 0.8 },
  hamlet: { streets: 1, houses: [3, 6], radiusKm: 0.15, clearKm: 0.5 },
} as const;
type SettlementKind = keyof typeof SETTLEMENT;

const round6 = (v: number) => Math.round(v * 1e6) / 1e6;
const dist = (a: LocalPoint, b: LocalPoint) => Math.hypot(a.x - b.x, a.y - b.y);

/** First letter and the next two consonants: "Kelvarrow" → "KLV"; unique across the island. */
function districtCodes(names: string[]): Map<string, string> {
  const codes = new Map<string, string>();
  const used = new Set<string>();
  for (const name of names) {
    const letters = name.toUpperCase().replace(/[^A-Z]/g, '');
    const consonants = letters.slice(1).replace(/[AEIOU]/g, '');
    let code = (letters[0]! + consonants).slice(0, 3).padEnd(3, 'X');
    for (let i = 3; used.has(code) && i < consonants.length + 1; i++) code = letters[0]! + consonants[0] + consonants[i - 1];
    used.add(code);
    codes.set(name, code);
  }
  return codes;
}

function pickUnique(random: Random, make: () => string, used: Set<string>): string {
  for (let i = 0; i < 50; i++) {
    const candidate = make();
    if (!used.has(candidate)) {
      used.add(candidate);
      return candidate;
    }
  }
  throw new Error('ran out of invented names');
}

export function generateDemoAddresses(seed = DEMO_SEED): DemoAddress[] {
  const scenario = generateDemoScenario(seed);
  const model = createIslandModel(seed);
  const random = createRandom(hashString('bearline-gazetteer') ^ seed);
  const settlements = scenario.basemap.places
    .filter((p): p is typeof p & { kind: SettlementKind } => p.kind in SETTLEMENT)
    .map((p) => ({ name: p.name!, kind: p.kind, at: toLocal({ lon: p.geometry.coordinates[0]!, lat: p.geometry.coordinates[1]! }) }));
  const codes = districtCodes(settlements.map((s) => s.name));
  const out: DemoAddress[] = [];
  const add = (label: string, postcode: string, p: LocalPoint) => {
    const g = toGeo(p);
    out.push({ label, postcode, lat: round6(g.lat), lon: round6(g.lon) });
  };

  // Houses in each settlement, numbered along short invented streets.
  for (const s of settlements) {
    const spec = SETTLEMENT[s.kind];
    const usedStreets = new Set<string>();
    for (let i = 0; i < spec.streets; i++) {
      const street = pickUnique(random, () => random.pick(STREETS), usedStreets);
      const heading = random.range(0, 2 * Math.PI);
      const start = { x: s.at.x + random.range(-spec.radiusKm, spec.radiusKm) * 0.6, y: s.at.y + random.range(-spec.radiusKm, spec.radiusKm) * 0.6 };
      const houses = random.int(spec.houses[0], spec.houses[1]);
      for (let n = 1; n <= houses; n++) {
        const along = Math.ceil(n / 2) * 0.03;
        const side = n % 2 ? 0.015 : -0.015;
        const p = {
          x: start.x + along * Math.cos(heading) - side * Math.sin(heading),
          y: start.y + along * Math.sin(heading) + side * Math.cos(heading),
        };
        if (!isOnLand(model, p)) continue;
        add(`${n} ${street}, ${s.name}`, `${codes.get(s.name)}-${i + 1}${String(10 + 3 * Math.floor((n - 1) / 6)).padStart(3, '0')}`, p);
      }
    }
  }

  // Farms and cottages along the named roads, away from the settlements.
  const usedFarms = new Set<string>();
  const ruralSeq = new Map<string, number>();
  for (const road of scenario.basemap.roads) {
    if (!road.name || road.kind === 'track') continue;
    const line = road.geometry.coordinates.map(([lon, lat]) => toLocal({ lon: lon!, lat: lat! }));
    let next = random.range(0.3, 1.2);
    let walked = 0;
    for (let i = 1; i < line.length; i++) {
      const a = line[i - 1]!;
      const b = line[i]!;
      const seg = dist(a, b);
      while (seg > 0 && next <= walked + seg) {
        const t = (next - walked) / seg;
        const nx = -(b.y - a.y) / seg;
        const ny = (b.x - a.x) / seg;
        const offset = random.range(0.06, 0.35) * (random.chance(0.5) ? 1 : -1);
        const p = { x: a.x + t * (b.x - a.x) + nx * offset, y: a.y + t * (b.y - a.y) + ny * offset };
        next += random.range(0.7, 1.6);
        const nearest = settlements.reduce((best, s) => (dist(s.at, p) < dist(best.at, p) ? s : best));
        if (dist(nearest.at, p) < SETTLEMENT[nearest.kind].clearKm || !isOnLand(model, p)) continue;
        const farm = pickUnique(random, () => `${random.pick(FARM_FIRST)} ${random.pick(FARM_LAST)}`, usedFarms);
        const code = codes.get(nearest.name)!;
        const seq = (ruralSeq.get(code) ?? 0) + 1;
        ruralSeq.set(code, seq);
        add(`${farm}, ${road.name}, ${nearest.name}`, `${code}-9${String(seq).padStart(3, '0')}`, p);
      }
      walked += seg;
    }
  }
  return out;
}

export async function seed(knex: Knex): Promise<void> {
  await knex.raw('TRUNCATE addresses RESTART IDENTITY');
  const rows = generateDemoAddresses();
  for (let i = 0; i < rows.length; i += 500) {
    await knex('addresses').insert(
      rows.slice(i, i + 500).map((a) => ({
        label: a.label,
        postcode: a.postcode,
        geom: knex.raw('ST_SetSRID(ST_MakePoint(?, ?), 4326)', [a.lon, a.lat]),
        source: 'demo',
      })),
    );
  }
}
