// Basemap features of the demo island: the land polygon, lakes and rivers, the road network
// joining the settlements, land cover and named places. Local-frame geometry; scenario.ts turns
// it into GeoJSON.
import { createBlobRing, isOnLand, meander, type IslandModel, type Place } from './geography';
import type { ElevationFn } from './elevation';
import { distanceKm, samplePolyline, type LocalPoint } from './projection';
import type { Random } from './random';

export type RoadKind = 'primary' | 'secondary' | 'minor' | 'track';

export interface Road {
  name: string | null;
  ref: string | null;
  kind: RoadKind;
  line: LocalPoint[];
}

export type LanduseKind = 'residential' | 'farmland' | 'wood' | 'moor';

export interface LanduseArea {
  name: string | null;
  kind: LanduseKind;
  ring: LocalPoint[];
}

export type PlaceLabelKind = 'town' | 'village' | 'hamlet' | 'peak' | 'island';

export interface PlaceLabel {
  name: string;
  kind: PlaceLabelKind;
  rank: number;
  population: number | null;
  eleM: number | null;
  at: LocalPoint;
}

// The road network, written out like a road atlas: each road runs through the places listed.
const ROAD_PLAN: Array<{ name: string; ref: string | null; kind: RoadKind; via: string[] }> = [
  { name: 'Tessary Road', ref: 'R1', kind: 'primary', via: ['Port Tessary', 'Greythorn Cross', 'Kelvarrow'] },
  { name: 'North Road', ref: 'R1', kind: 'primary', via: ['Kelvarrow', 'Corrowby', 'Ulvenholm'] },
  { name: 'Ennerlow Road', ref: 'R2', kind: 'primary', via: ['Kelvarrow', 'Owlmere End', 'Brackhithe'] },
  { name: 'Fennock Road', ref: 'R3', kind: 'secondary', via: ['Kelvarrow', 'Quarrendale', 'Fennock'] },
  { name: 'East Coast Road', ref: 'R4', kind: 'secondary', via: ['Port Tessary', 'Windle Hope', 'Fennock', "Maddock's Reach"] },
  { name: 'South Coast Road', ref: 'R5', kind: 'secondary', via: ['Port Tessary', 'Drumhallow', 'Brackhithe'] },
  { name: 'West Coast Road', ref: 'R6', kind: 'secondary', via: ['Brackhithe', 'Pellow Strand', 'Thistlecarn', 'Sallowcombe', 'Ulvenholm'] },
  { name: 'Fell Road', ref: null, kind: 'minor', via: ['Kelvarrow', 'Tarnavel', 'Sallowcombe'] },
  { name: 'Quarren Lane', ref: null, kind: 'minor', via: ['Quarrendale', 'Ulvenholm'] },
  { name: 'Drum Lane', ref: null, kind: 'minor', via: ['Drumhallow', 'Greythorn Cross'] },
  { name: 'Thistle Lane', ref: null, kind: 'minor', via: ['Thistlecarn', 'Tarnavel'] },
];

function isClear(model: IslandModel, line: LocalPoint[]): boolean {
  return line.every((p) => isOnLand(model, p)) && samplePolyline(line, 0.05).every((p) => isOnLand(model, p));
}

/**
 * A road from a to b that stays on dry land: a gently winding line, or failing that a detour
 * pushed sideways round the lake or bay in the way.
 */
export function routeRoad(model: IslandModel, random: Random, a: LocalPoint, b: LocalPoint, amplitudeKm: number): LocalPoint[] | null {
  for (let attempt = 0; attempt < 6; attempt++) {
    const line = meander(random, [a, b], 0.2, amplitudeKm * (1 - attempt / 6));
    if (isClear(model, line)) return line;
  }
  const len = distanceKm(a, b);
  const nx = -(b.y - a.y) / len;
  const ny = (b.x - a.x) / len;
  for (let push = 0.3; push <= 4; push += 0.3) {
    for (const side of [1, -1]) {
      for (const at of [0.5, 0.35, 0.65]) {
        const via = { x: a.x + at * (b.x - a.x) + side * push * nx, y: a.y + at * (b.y - a.y) + side * push * ny };
        const line = meander(random, [a, via, b], 0.2, amplitudeKm * 0.3);
        if (isClear(model, line)) return line;
      }
    }
  }
  return null;
}

function placeByName(model: IslandModel, name: string): Place {
  const place = model.places.find((p) => p.name === name);
  if (!place) throw new Error(`Unknown demo place ${name}`);
  return place;
}

export function createRoads(model: IslandModel, random: Random): Road[] {
  return ROAD_PLAN.map((plan) => {
    const amplitude = plan.kind === 'primary' ? 0.25 : plan.kind === 'secondary' ? 0.4 : 0.5;
    const line: LocalPoint[] = [];
    for (let i = 1; i < plan.via.length; i++) {
      const from = placeByName(model, plan.via[i - 1]!).at;
      const to = placeByName(model, plan.via[i]!).at;
      const leg = routeRoad(model, random, from, to, amplitude) ?? [from, to];
      line.push(...(i === 1 ? leg : leg.slice(1)));
    }
    return { name: plan.name, ref: plan.ref, kind: plan.kind, line };
  });
}

/** The nearest point of each road segment to p, nearest first. */
export function listNearestRoadPoints(roads: Road[], p: LocalPoint): LocalPoint[] {
  const found: Array<{ q: LocalPoint; d: number }> = [];
  for (const road of roads) {
    for (let i = 1; i < road.line.length; i++) {
      const a = road.line[i - 1]!;
      const b = road.line[i]!;
      const dx = b.x - a.x;
      const dy = b.y - a.y;
      const len2 = dx * dx + dy * dy || 1;
      const t = Math.max(0, Math.min(1, ((p.x - a.x) * dx + (p.y - a.y) * dy) / len2));
      const q = { x: a.x + t * dx, y: a.y + t * dy };
      found.push({ q, d: distanceKm(p, q) });
    }
  }
  return found.sort((a, b) => a.d - b.d).map((f) => f.q);
}

export function createLanduse(model: IslandModel, elevation: ElevationFn, random: Random): LanduseArea[] {
  const areas: LanduseArea[] = [];
  const settlements = model.places.filter((p) => p.kind !== 'hamlet');
  for (const place of settlements) {
    const farmKm = place.kind === 'town' ? random.range(2.4, 3.2) : random.range(1.6, 2.2);
    areas.push({ name: null, kind: 'farmland', ring: createBlobRing(random, place.at, farmKm, farmKm * random.range(0.6, 0.9), random.range(0, 180), 56) });
  }
  for (const peak of model.peaks.filter((p) => p.name && p.heightM >= 300)) {
    const r = peak.sigmaKm * 1.1;
    areas.push({ name: null, kind: 'moor', ring: createBlobRing(random, peak.centre, r, r * 0.8, random.range(0, 180), 48) });
  }
  // Woods on the mid slopes, away from the settlements.
  let woods = 0;
  for (let attempt = 0; attempt < 400 && woods < 14; attempt++) {
    const c = { x: random.range(-18, 18), y: random.range(-12, 12) };
    if (!isOnLand(model, c)) continue;
    const e = elevation(c);
    if (e < 60 || e > 380) continue;
    if (settlements.some((s) => distanceKm(s.at, c) < 1.6)) continue;
    if (areas.some((a) => a.kind === 'wood' && distanceKm(a.ring[0]!, c) < 2.5)) continue;
    const r = random.range(0.6, 1.6);
    areas.push({ name: null, kind: 'wood', ring: createBlobRing(random, c, r, r * random.range(0.5, 0.9), random.range(0, 180), 40) });
    woods++;
  }
  for (const place of settlements) {
    const r = place.kind === 'town' ? 0.45 + place.population / 10000 : 0.28;
    areas.push({ name: place.name, kind: 'residential', ring: createBlobRing(random, place.at, r, r * 0.8, random.range(0, 180), 32) });
  }
  return areas;
}

/** Where a named hill actually tops out (its gaussian plus the roughness), searched near its centre. */
function findSummit(model: IslandModel, elevation: ElevationFn, centre: LocalPoint): { at: LocalPoint; eleM: number } {
  let best = { at: centre, eleM: elevation(centre) };
  for (let dx = -1; dx <= 1.0001; dx += 0.1) {
    for (let dy = -1; dy <= 1.0001; dy += 0.1) {
      const p = { x: centre.x + dx, y: centre.y + dy };
      if (!isOnLand(model, p)) continue;
      const e = elevation(p);
      if (e > best.eleM) best = { at: p, eleM: e };
    }
  }
  return best;
}

export function createPlaceLabels(model: IslandModel, elevation: ElevationFn): PlaceLabel[] {
  const rankOf = { town: 1, village: 2, hamlet: 3 } as const;
  const labels: PlaceLabel[] = model.places.map((p) => ({
    name: p.name,
    kind: p.kind,
    rank: rankOf[p.kind],
    population: p.population,
    eleM: Math.round(elevation(p.at)),
    at: p.at,
  }));
  for (const peak of model.peaks) {
    if (!peak.name) continue;
    const summit = findSummit(model, elevation, peak.centre);
    labels.push({ name: peak.name, kind: 'peak', rank: 3, population: null, eleM: Math.round(summit.eleM), at: summit.at });
  }
  labels.push({ name: `${model.name} Island`, kind: 'island', rank: 0, population: null, eleM: null, at: { x: 0, y: 0 } });
  return labels;
}
