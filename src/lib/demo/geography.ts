// The invented island of the demo scenario: its outline, hills, settlements, lakes and
// rivers. Everything is described in "island polar" terms (angle round the island and a
// radius where 0 is the middle and 1 the coast), so features stay on land whatever the
// generated coastline looks like. All names are invented for the demo.
import { createRandom, type Random } from './random';
import { distanceKm, isInRing, type LocalPoint } from './projection';

export const DEMO_SEED = 20261201;
export const ISLAND_NAME = 'Marrowen';

/** A place on the island: angle in degrees (counter-clockwise from the island's long axis) and normalised radius. */
export interface PolarSpot {
  theta: number;
  rho: number;
}

export type PlaceKind = 'town' | 'village' | 'hamlet';

interface PeakSpec {
  name: string | null;
  at: PolarSpot;
  heightM: number;
  sigmaKm: number;
  /** Ridges: the hill is `stretch` times longer along `axisDeg` (compass-free, local frame). */
  stretch?: number;
  axisDeg?: number;
}

interface PlaceSpec {
  name: string;
  kind: PlaceKind;
  at: PolarSpot;
  population: number;
}

interface LakeSpec {
  name: string;
  at: PolarSpot;
  radiusXKm: number;
  radiusYKm: number;
  axisDeg: number;
}

interface RiverSpec {
  name: string;
  kind: 'river' | 'stream';
  /** Source first, mouth last (the mouth lies just offshore so the line meets the coast). */
  path: PolarSpot[];
  fromLake?: string;
}

const polar = (theta: number, rho: number): PolarSpot => ({ theta, rho });

export const DEMO_RECIPE = {
  shape: {
    semiMajorKm: 19,
    semiMinorKm: 14,
    rotationDeg: 12,
    bumps: [
      { theta: 0, widthDeg: 9, amp: 0.22 },
      { theta: 333, widthDeg: 7, amp: -0.12 },
      { theta: 233, widthDeg: 8, amp: -0.14 },
      { theta: 160, widthDeg: 10, amp: 0.1 },
    ],
  },
  peaks: [
    { name: 'Mount Heskeld', at: { theta: 165, rho: 0.45 }, heightM: 610, sigmaKm: 3.0 },
    { name: 'Carrow Fell', at: { theta: 38, rho: 0.5 }, heightM: 400, sigmaKm: 2.6 },
    { name: 'Ulver Knott', at: { theta: 122, rho: 0.62 }, heightM: 340, sigmaKm: 2.0 },
    { name: 'Brannock Hill', at: { theta: 252, rho: 0.55 }, heightM: 300, sigmaKm: 2.2 },
    { name: 'Saltreach Down', at: { theta: 300, rho: 0.45 }, heightM: 240, sigmaKm: 2.6 },
    { name: 'Hollin Ridge', at: { theta: 200, rho: 0.2 }, heightM: 250, sigmaKm: 1.3, stretch: 3, axisDeg: 25 },
    { name: 'Fennock Beacon', at: { theta: 8, rho: 0.68 }, heightM: 210, sigmaKm: 1.8 },
  ] satisfies PeakSpec[],
  places: [
    { name: 'Port Tessary', kind: 'town', at: { theta: 316, rho: 0.88 }, population: 4200 },
    { name: 'Kelvarrow', kind: 'town', at: { theta: 75, rho: 0.14 }, population: 2600 },
    { name: 'Ulvenholm', kind: 'town', at: { theta: 96, rho: 0.87 }, population: 1800 },
    { name: 'Brackhithe', kind: 'village', at: { theta: 216, rho: 0.87 }, population: 650 },
    { name: 'Fennock', kind: 'village', at: { theta: 22, rho: 0.84 }, population: 540 },
    { name: 'Sallowcombe', kind: 'village', at: { theta: 142, rho: 0.74 }, population: 420 },
    { name: 'Drumhallow', kind: 'village', at: { theta: 272, rho: 0.78 }, population: 380 },
    { name: 'Thistlecarn', kind: 'hamlet', at: { theta: 182, rho: 0.72 }, population: 120 },
    { name: 'Owlmere End', kind: 'hamlet', at: { theta: 226, rho: 0.4 }, population: 90 },
    { name: 'Quarrendale', kind: 'hamlet', at: { theta: 62, rho: 0.68 }, population: 110 },
    { name: 'Greythorn Cross', kind: 'hamlet', at: { theta: 290, rho: 0.3 }, population: 140 },
    { name: 'Tarnavel', kind: 'hamlet', at: { theta: 150, rho: 0.28 }, population: 70 },
    { name: 'Windle Hope', kind: 'hamlet', at: { theta: 343, rho: 0.6 }, population: 100 },
    { name: 'Corrowby', kind: 'hamlet', at: { theta: 108, rho: 0.45 }, population: 80 },
    { name: "Maddock's Reach", kind: 'hamlet', at: { theta: 2, rho: 0.9 }, population: 60 },
    { name: 'Pellow Strand', kind: 'hamlet', at: { theta: 196, rho: 0.9 }, population: 75 },
  ] satisfies PlaceSpec[],
  lakes: [
    { name: 'Lake Ennerlow', at: { theta: 238, rho: 0.2 }, radiusXKm: 1.6, radiusYKm: 0.7, axisDeg: 30 },
    { name: 'Aldwater', at: { theta: 52, rho: 0.76 }, radiusXKm: 0.6, radiusYKm: 0.38, axisDeg: -20 },
  ] satisfies LakeSpec[],
  rivers: [
    {
      name: 'River Tessa',
      kind: 'river',
      fromLake: 'Lake Ennerlow',
      path: [polar(238, 0.2), polar(268, 0.34), polar(296, 0.56), polar(309, 0.8), polar(311, 1.04)],
    },
    { name: 'Kelder Beck', kind: 'river', path: [polar(62, 0.38), polar(80, 0.58), polar(91, 0.84), polar(92, 1.04)] },
    { name: 'Fenn Water', kind: 'river', path: [polar(178, 0.3), polar(196, 0.56), polar(210, 0.8), polar(212, 1.04)] },
    { name: 'Ald Burn', kind: 'stream', fromLake: 'Aldwater', path: [polar(52, 0.76), polar(40, 0.9), polar(36, 1.04)] },
  ] satisfies RiverSpec[],
};

interface Harmonic {
  k: number;
  amp: number;
  phase: number;
}

export interface IslandShape {
  semiMajorKm: number;
  semiMinorKm: number;
  rotationDeg: number;
  harmonics: Harmonic[];
  /** Headlands (positive) and bays (negative) at set angles. */
  bumps: Array<{ theta: number; widthDeg: number; amp: number }>;
}

export interface Peak {
  name: string | null;
  centre: LocalPoint;
  heightM: number;
  sigmaKm: number;
  stretch: number;
  axisDeg: number;
}

export interface Place {
  name: string;
  kind: PlaceKind;
  at: LocalPoint;
  population: number;
}

export interface Lake {
  name: string;
  centre: LocalPoint;
  ring: LocalPoint[];
}

export interface River {
  name: string;
  kind: 'river' | 'stream';
  line: LocalPoint[];
  fromLake: string | null;
}

export interface IslandModel {
  seed: number;
  name: string;
  shape: IslandShape;
  coastline: LocalPoint[];
  peaks: Peak[];
  places: Place[];
  lakes: Lake[];
  rivers: River[];
}

const RAD = Math.PI / 180;

function createShape(random: Random): IslandShape {
  const harmonics: Harmonic[] = [];
  // Broad lobes and bays, then a ragged fringe of small coves and headlands.
  for (let k = 2; k <= 9; k++) harmonics.push({ k, amp: (0.2 / k) * random.range(0.5, 1), phase: random.range(0, 2 * Math.PI) });
  for (let k = 13; k <= 41; k += 4) harmonics.push({ k, amp: random.range(0.004, 0.012), phase: random.range(0, 2 * Math.PI) });
  return { ...DEMO_RECIPE.shape, harmonics };
}

/** Coast radius (in ellipse units) in direction theta (radians, ellipse frame). */
function coastRadius(shape: IslandShape, theta: number): number {
  let r = 1;
  for (const h of shape.harmonics) r += h.amp * Math.cos(h.k * theta + h.phase);
  for (const b of shape.bumps) {
    const d = ((((theta / RAD - b.theta) % 360) + 540) % 360) - 180;
    r += b.amp * Math.exp(-((d / b.widthDeg) ** 2));
  }
  return r;
}

function toEllipseFrame(shape: IslandShape, p: LocalPoint): { u: number; v: number } {
  const c = Math.cos(shape.rotationDeg * RAD);
  const s = Math.sin(shape.rotationDeg * RAD);
  return { u: (p.x * c + p.y * s) / shape.semiMajorKm, v: (-p.x * s + p.y * c) / shape.semiMinorKm };
}

/** 0 in the island's middle, 1 on the coast, above 1 at sea. */
export function getNormalisedRadius(shape: IslandShape, p: LocalPoint): number {
  const { u, v } = toEllipseFrame(shape, p);
  return Math.hypot(u, v) / coastRadius(shape, Math.atan2(v, u));
}

export function fromPolar(shape: IslandShape, spot: PolarSpot): LocalPoint {
  const theta = spot.theta * RAD;
  const r = spot.rho * coastRadius(shape, theta);
  const u = r * Math.cos(theta) * shape.semiMajorKm;
  const v = r * Math.sin(theta) * shape.semiMinorKm;
  const c = Math.cos(shape.rotationDeg * RAD);
  const s = Math.sin(shape.rotationDeg * RAD);
  return { x: u * c - v * s, y: u * s + v * c };
}

/** A closed wobbly ellipse (first point repeated last). */
export function createBlobRing(random: Random, centre: LocalPoint, rxKm: number, ryKm: number, axisDeg: number, vertices = 40): LocalPoint[] {
  const wobble = [2, 3, 5].map((k) => ({ k, amp: random.range(0.03, 0.1), phase: random.range(0, 2 * Math.PI) }));
  const c = Math.cos(axisDeg * RAD);
  const s = Math.sin(axisDeg * RAD);
  const ring: LocalPoint[] = [];
  for (let i = 0; i < vertices; i++) {
    const a = (2 * Math.PI * i) / vertices;
    let f = 1;
    for (const w of wobble) f += w.amp * Math.cos(w.k * a + w.phase);
    const u = rxKm * f * Math.cos(a);
    const v = ryKm * f * Math.sin(a);
    ring.push({ x: centre.x + u * c - v * s, y: centre.y + u * s + v * c });
  }
  ring.push({ ...ring[0]! });
  return ring;
}

/** Adds gentle meanders to a polyline: points every ~stepKm, pushed sideways by a smooth wave. */
export function meander(random: Random, points: LocalPoint[], stepKm: number, amplitudeKm: number): LocalPoint[] {
  const out: LocalPoint[] = [{ ...points[0]! }];
  for (let i = 1; i < points.length; i++) {
    const a = points[i - 1]!;
    const b = points[i]!;
    const len = distanceKm(a, b);
    const n = Math.max(1, Math.round(len / stepKm));
    const nx = -(b.y - a.y) / (len || 1);
    const ny = (b.x - a.x) / (len || 1);
    const phase = random.range(0, 2 * Math.PI);
    const waves = random.int(1, 3);
    for (let j = 1; j <= n; j++) {
      const t = j / n;
      // Zero at both ends of the segment so the line still passes through its control points.
      const off = j === n ? 0 : amplitudeKm * Math.sin(Math.PI * t) * Math.sin(waves * Math.PI * t + phase);
      out.push({ x: a.x + t * (b.x - a.x) + off * nx, y: a.y + t * (b.y - a.y) + off * ny });
    }
  }
  return out;
}

/** Cuts a line that runs out to sea where it first meets the coast. */
function clipAtCoast(shape: IslandShape, line: LocalPoint[]): LocalPoint[] {
  const out: LocalPoint[] = [line[0]!];
  for (let i = 1; i < line.length; i++) {
    const a = line[i - 1]!;
    const b = line[i]!;
    const rb = getNormalisedRadius(shape, b);
    if (rb < 1) {
      out.push(b);
      continue;
    }
    // Bisect for the crossing.
    let lo = 0;
    let hi = 1;
    for (let k = 0; k < 30; k++) {
      const mid = (lo + hi) / 2;
      if (getNormalisedRadius(shape, { x: a.x + mid * (b.x - a.x), y: a.y + mid * (b.y - a.y) }) < 1) lo = mid;
      else hi = mid;
    }
    out.push({ x: a.x + hi * (b.x - a.x), y: a.y + hi * (b.y - a.y) });
    break;
  }
  return out;
}

export function createIslandModel(seed = DEMO_SEED): IslandModel {
  const random = createRandom(seed);
  const shape = createShape(random.fork('shape'));
  const coastline: LocalPoint[] = [];
  const vertices = 720;
  for (let i = 0; i < vertices; i++) coastline.push(fromPolar(shape, { theta: (360 * i) / vertices, rho: 1 }));
  coastline.push({ ...coastline[0]! });

  const peaks: Peak[] = DEMO_RECIPE.peaks.map((p: PeakSpec) => ({
    name: p.name,
    centre: fromPolar(shape, p.at),
    heightM: p.heightM,
    sigmaKm: p.sigmaKm,
    stretch: p.stretch ?? 1,
    axisDeg: p.axisDeg ?? 0,
  }));
  // Unnamed knolls give the lowland some relief.
  const knolls = random.fork('knolls');
  for (let i = 0; i < 12; i++) {
    peaks.push({
      name: null,
      centre: fromPolar(shape, { theta: knolls.range(0, 360), rho: knolls.range(0.1, 0.8) }),
      heightM: knolls.range(40, 150),
      sigmaKm: knolls.range(0.8, 1.8),
      stretch: knolls.range(1, 2),
      axisDeg: knolls.range(0, 180),
    });
  }

  const places = DEMO_RECIPE.places.map((p) => ({ name: p.name, kind: p.kind as PlaceKind, at: fromPolar(shape, p.at), population: p.population }));

  const lakeRandom = random.fork('lakes');
  const lakes: Lake[] = DEMO_RECIPE.lakes.map((l) => {
    const centre = fromPolar(shape, l.at);
    return { name: l.name, centre, ring: createBlobRing(lakeRandom, centre, l.radiusXKm, l.radiusYKm, l.axisDeg, 48) };
  });

  const riverRandom = random.fork('rivers');
  const rivers: River[] = DEMO_RECIPE.rivers.map((r: RiverSpec) => {
    const control = r.path.map((spot) => fromPolar(shape, spot));
    const lake = r.fromLake ? lakes.find((l) => l.name === r.fromLake) : undefined;
    if (lake) {
      // Leave the lake from the rim point nearest the next bend.
      const towards = control[1]!;
      control[0] = lake.ring.reduce((best, q) => (distanceKm(q, towards) < distanceKm(best, towards) ? q : best));
    }
    const line = meander(riverRandom, control, 0.25, r.kind === 'river' ? 0.35 : 0.15);
    return { name: r.name, kind: r.kind, line: clipAtCoast(shape, line), fromLake: r.fromLake ?? null };
  });

  return { seed, name: ISLAND_NAME, shape, coastline, peaks, places, lakes, rivers };
}

export function isInLake(model: IslandModel, p: LocalPoint): boolean {
  return model.lakes.some((l) => isInRing(p, l.ring));
}

/** On dry land: inside the coastline and not in a lake. */
export function isOnLand(model: IslandModel, p: LocalPoint): boolean {
  return getNormalisedRadius(model.shape, p) < 1 && !isInLake(model, p);
}
