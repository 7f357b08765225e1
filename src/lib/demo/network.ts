// The demo radio network: three invented operators on the test network code MCC 001, masts
// placed where a planner would put them (hilltops, town edges, along the main roads) and
// their cells, with channel numbers inside their bands and PCIs planned per site.
import { getBand, lookupChannel } from '../domain/channels';
import { isOnLand, type IslandModel } from './geography';
import type { ElevationFn } from './elevation';
import type { Road } from './basemap';
import { bearingDeg, distanceKm, samplePolyline, type LocalPoint } from './projection';
import type { Random } from './random';

export interface DemoOperatorSpec {
  id: number;
  name: string;
  mcc: string;
  mnc: string;
  /** Okabe–Ito colour-blind-safe palette (Okabe & Ito, "Color Universal Design", 2008). */
  colour: string;
}

export const DEMO_OPERATORS: DemoOperatorSpec[] = [
  { id: 1, name: 'Orvane Mobile', mcc: '001', mnc: '01', colour: '#0072b2' },
  { id: 2, name: 'Pellimore Networks', mcc: '001', mnc: '02', colour: '#e69f00' },
  { id: 3, name: 'Quillfern Wireless', mcc: '001', mnc: '03', colour: '#009e73' },
];

type Layer = 'low' | 'low2' | 'mid' | 'mid2' | 'high' | 'nr-low' | 'nr-mid';

interface Carrier {
  tech: 'lte' | 'nr';
  band: string;
  channel: number;
  bandwidthMhz: number;
  rsPowerDbm: number;
}

/** A carrier of one technology; reference-signal power 15.2 dBm unless given. */
const carrier =
  (tech: Carrier['tech']) =>
  (band: string, channel: number, bandwidthMhz: number, rsPowerDbm = 15.2): Carrier => ({ tech, band, channel, bandwidthMhz, rsPowerDbm });
const lte = carrier('lte');
const nr = carrier('nr');

// Each operator's licensed carriers (invented assignments inside real 3GPP bands).
const SPECTRUM: Record<number, Partial<Record<Layer, Carrier>>> = {
  1: {
    low: lte('B20', 6200, 10),
    mid: lte('B3', 1300, 20),
    high: lte('B7', 2850, 20),
    'nr-mid': nr('n78', 630000, 100, 18),
  },
  2: {
    low: lte('B20', 6300, 10),
    low2: lte('B8', 3500, 10),
    mid: lte('B3', 1500, 20),
    mid2: lte('B1', 100, 20),
    'nr-low': nr('n28', 154600, 10),
  },
  3: {
    low: lte('B8', 3700, 10),
    low2: lte('B20', 6400, 10),
    mid: lte('B3', 1700, 20),
    mid2: lte('B1', 300, 15),
    high: lte('B7', 3050, 20),
    'nr-low': nr('n28', 152600, 10),
    'nr-mid': nr('n78', 640000, 100, 18),
  },
};

export type SiteKind = 'hilltop' | 'town' | 'village' | 'roadside' | 'hamlet';
export type StructureType = 'lattice_tower' | 'monopole' | 'guyed_mast' | 'rooftop' | 'pole' | 'water_tower';
export type MastStatus = 'active' | 'planned' | 'decommissioned';

export interface DemoMastPlan {
  id: number;
  name: string;
  reference: string;
  at: LocalPoint;
  siteKind: SiteKind;
  groundElevationM: number;
  structureHeightM: number;
  structureType: StructureType;
  status: MastStatus;
  accessNotes: string | null;
}

export interface DemoCellPlan {
  id: number;
  mastId: number;
  operatorId: number;
  tech: 'lte' | 'nr';
  band: string;
  channel: number;
  dlMhz: number;
  pci: number;
  cellIdentity: number;
  sectorAzimuthDeg: number;
  antennaHeightM: number;
  bandwidthMhz: number;
  rsPowerDbm: number;
  /**
   * The cell's hidden real-world offset from the prediction model (antenna, tilt, feeder …), in dB.
   * Readings include it; nothing stores it, so calibration has a real effect to find.
   */
  biasDb: number;
}

interface Candidate {
  at: LocalPoint;
  kind: SiteKind;
  name: string;
  minSpacingKm: number;
}

const COMPASS = ['North', 'North East', 'East', 'South East', 'South', 'South West', 'West', 'North West'];

function compassWord(deg: number): string {
  return COMPASS[Math.round(deg / 45) % 8]!;
}

function findHilltops(model: IslandModel, elevation: ElevationFn): Array<{ at: LocalPoint; eleM: number }> {
  const step = 0.25;
  const tops: Array<{ at: LocalPoint; eleM: number }> = [];
  for (let x = -22; x <= 22; x += step) {
    for (let y = -16; y <= 16; y += step) {
      const p = { x, y };
      if (!isOnLand(model, p)) continue;
      const e = elevation(p);
      if (e < 110) continue;
      let isTop = true;
      for (const [dx, dy] of [
        [1, 0],
        [-1, 0],
        [0, 1],
        [0, -1],
        [1, 1],
        [1, -1],
        [-1, 1],
        [-1, -1],
      ] as const) {
        if (elevation({ x: x + dx * step * 2, y: y + dy * step * 2 }) > e) {
          isTop = false;
          break;
        }
      }
      if (isTop) tops.push({ at: p, eleM: e });
    }
  }
  return tops.sort((a, b) => b.eleM - a.eleM);
}

function nearestPlaceName(model: IslandModel, p: LocalPoint): { name: string; distanceKm: number; bearing: number } {
  let best = model.places[0]!;
  for (const place of model.places) if (distanceKm(place.at, p) < distanceKm(best.at, p)) best = place;
  return { name: best.name, distanceKm: distanceKm(best.at, p), bearing: bearingDeg(best.at, p) };
}

function nearestPeakName(model: IslandModel, p: LocalPoint): string | null {
  const named = model.peaks.filter((k) => k.name && distanceKm(k.centre, p) < k.sigmaKm * 1.2);
  named.sort((a, b) => distanceKm(a.centre, p) - distanceKm(b.centre, p));
  return named[0]?.name ?? null;
}

function listCandidates(model: IslandModel, elevation: ElevationFn, roads: Road[], random: Random): Candidate[] {
  const out: Candidate[] = [];
  const hilltops: Array<{ at: LocalPoint; eleM: number }> = [];
  for (const top of findHilltops(model, elevation)) {
    if (hilltops.some((h) => distanceKm(h.at, top.at) < 3.5)) continue;
    hilltops.push(top);
    if (hilltops.length === 14) break;
  }
  for (const top of hilltops) {
    const peak = nearestPeakName(model, top.at);
    const near = nearestPlaceName(model, top.at);
    out.push({ at: top.at, kind: 'hilltop', name: peak ? `${peak} Summit` : `${near.name} Hill`, minSpacingKm: 2 });
  }
  for (const place of model.places) {
    const count = place.kind === 'town' ? 3 : place.kind === 'village' ? 1 : random.chance(0.7) ? 1 : 0;
    const base = random.range(0, 360);
    for (let i = 0; i < count; i++) {
      const dir = base + (360 * i) / count + random.range(-20, 20);
      const dist = place.kind === 'town' ? random.range(0.6, 1.3) : random.range(0.3, 0.7);
      const rad = (dir * Math.PI) / 180;
      const at = { x: place.at.x + dist * Math.sin(rad), y: place.at.y + dist * Math.cos(rad) };
      const kind: SiteKind = place.kind === 'town' ? 'town' : place.kind === 'village' ? 'village' : 'hamlet';
      out.push({ at, kind, name: count === 1 ? place.name : `${place.name} ${compassWord(dir)}`, minSpacingKm: place.kind === 'town' ? 0.8 : 1.5 });
    }
  }
  for (const road of roads.filter((r) => r.kind === 'primary' || r.kind === 'secondary')) {
    for (const p of samplePolyline(road.line, 3).slice(1, -1)) {
      const at = { x: p.x + random.range(-0.25, 0.25), y: p.y + random.range(-0.25, 0.25) };
      const near = nearestPlaceName(model, at);
      out.push({ at, kind: 'roadside', name: `${near.name} ${compassWord(near.bearing)}`, minSpacingKm: 2.5 });
    }
  }
  return out;
}

/** Site priorities: coverage from the hills first, then the towns, then villages, roads and hamlets. */
const KIND_ORDER: SiteKind[] = ['hilltop', 'town', 'village', 'roadside', 'hamlet'];

function chooseStructure(kind: SiteKind, random: Random): { type: StructureType; heightM: number } {
  switch (kind) {
    case 'hilltop':
      return random.chance(0.7) ? { type: 'lattice_tower', heightM: random.int(35, 50) } : { type: 'guyed_mast', heightM: random.int(40, 60) };
    case 'town':
      return random.pick([
        { type: 'monopole', heightM: random.int(20, 27) },
        { type: 'rooftop', heightM: random.int(14, 19) },
        { type: 'monopole', heightM: random.int(18, 25) },
        { type: 'water_tower', heightM: random.int(24, 30) },
      ] as const);
    case 'village':
      return { type: 'monopole', heightM: random.int(18, 25) };
    default:
      return random.chance(0.5) ? { type: 'pole', heightM: random.int(12, 16) } : { type: 'monopole', heightM: random.int(15, 22) };
  }
}

const ACCESS_NOTES: Record<SiteKind, string[]> = {
  hilltop: [
    'Track from the road is gated; key held at the farm below. Four-wheel drive after rain.',
    'Steep unmade track, last 400 m on foot in winter. Compound fenced.',
    'Access by the forestry track; allow 20 minutes from the road.',
  ],
  town: [
    'Compound behind the fire station yard; sign in at the front desk.',
    'Roof access through the plant room, escort needed.',
    'Fenced compound by the car park.',
  ],
  village: ['Compound beside the village hall car park.', 'Field edge compound, gate on the lane.'],
  roadside: ['Lay-by next to the compound.', 'Verge access, park clear of the bend.'],
  hamlet: ['Farm yard compound; ring ahead.', 'Gate on the lane, cattle grid.'],
};

export interface DemoNetwork {
  masts: DemoMastPlan[];
  cells: DemoCellPlan[];
}

export function createNetwork(model: IslandModel, elevation: ElevationFn, roads: Road[], random: Random, mastCount = 40): DemoNetwork {
  const candidates = listCandidates(model, elevation, roads, random.fork('candidates'));
  candidates.sort((a, b) => KIND_ORDER.indexOf(a.kind) - KIND_ORDER.indexOf(b.kind));
  const chosen: Candidate[] = [];
  const usedNames = new Set<string>();
  for (const c of candidates) {
    if (chosen.length === mastCount) break;
    if (!isOnLand(model, c.at) || elevation(c.at) < 3) continue;
    if (chosen.some((m) => distanceKm(m.at, c.at) < Math.max(c.minSpacingKm, m.minSpacingKm))) continue;
    let name = c.name;
    for (let n = 2; usedNames.has(name); n++) name = `${c.name} ${n}`;
    usedNames.add(name);
    chosen.push({ ...c, name });
  }

  const r = random.fork('masts');
  // A few masts are planned (not built yet) or decommissioned; none of them carries live cells.
  const lateIndexes = chosen.map((_, i) => i).filter((i) => chosen[i]!.kind !== 'hilltop');
  const planned = new Set(lateIndexes.slice(-3));
  const decommissioned = new Set([lateIndexes[Math.floor(lateIndexes.length / 3)]!, lateIndexes[Math.floor((2 * lateIndexes.length) / 3)]!]);

  const masts: DemoMastPlan[] = chosen.map((c, i) => {
    const structure = chooseStructure(c.kind, r);
    const status: MastStatus = planned.has(i) ? 'planned' : decommissioned.has(i) ? 'decommissioned' : 'active';
    return {
      id: i + 1,
      name: c.name,
      reference: `MRW-${String(i + 1).padStart(3, '0')}`,
      at: c.at,
      siteKind: c.kind,
      groundElevationM: Math.round(elevation(c.at) * 10) / 10,
      structureHeightM: structure.heightM,
      structureType: structure.type,
      status,
      accessNotes: r.chance(0.6) ? r.pick(ACCESS_NOTES[c.kind]) : null,
    };
  });

  return { masts, cells: createCells(masts, random.fork('cells')) };
}

function chooseOperators(kind: SiteKind, siteCount: Map<number, number>, random: Random): number[] {
  const count = kind === 'hilltop' ? random.pick([1, 1, 2, 2, 3]) : kind === 'town' ? random.pick([1, 1, 2]) : 1;
  // Spread the sites: operators with fewer sites so far come first.
  const order = DEMO_OPERATORS.map((o) => o.id)
    .map((id) => ({ id, key: (siteCount.get(id) ?? 0) + random.next() * 1.5 }))
    .sort((a, b) => a.key - b.key)
    .map((o) => o.id);
  const ops = order.slice(0, count).sort((a, b) => a - b);
  for (const id of ops) siteCount.set(id, (siteCount.get(id) ?? 0) + 1);
  return ops;
}

function chooseLayers(kind: SiteKind, operatorId: number, random: Random): Layer[] {
  const spectrum = SPECTRUM[operatorId]!;
  const has = (l: Layer) => spectrum[l] !== undefined;
  const layers: Layer[] = [];
  if (kind === 'town') {
    if (random.chance(0.6)) layers.push('low');
    layers.push(has('mid2') && random.chance(0.35) ? 'mid2' : 'mid');
    if (has('high') && random.chance(0.3)) layers.push('high');
    if (has('nr-mid') && random.chance(0.7)) layers.push('nr-mid');
  } else if (kind === 'hilltop') {
    layers.push('low');
    if (has('low2') && random.chance(0.25)) layers.push('low2');
    if (has('nr-low') && random.chance(0.25)) layers.push('nr-low');
  } else {
    layers.push('low');
    if (kind === 'village' && random.chance(0.3)) layers.push('mid');
  }
  return layers;
}

function createCells(masts: DemoMastPlan[], random: Random): DemoCellPlan[] {
  const cells: DemoCellPlan[] = [];
  const siteCount = new Map<number, number>();
  // PCI planning: each operator site takes one group of three PCIs (3·N_ID1 + N_ID2, TS 36.211 §6.11),
  // drawn without repeats per operator and technology.
  const groups = new Map<string, number[]>();
  const takeGroup = (operatorId: number, tech: 'lte' | 'nr') => {
    const key = `${operatorId}:${tech}`;
    if (!groups.has(key)) {
      const all = Array.from({ length: tech === 'lte' ? 168 : 336 }, (_, i) => i);
      for (let i = all.length - 1; i > 0; i--) {
        const j = random.int(0, i);
        [all[i], all[j]] = [all[j]!, all[i]!];
      }
      groups.set(key, all);
    }
    return groups.get(key)!.pop()!;
  };
  const nodeSeq = new Map<number, number>();

  for (const mast of masts) {
    if (mast.status !== 'active') continue;
    const operators = chooseOperators(mast.siteKind, siteCount, random);
    const rotation = Math.round(random.range(0, 120) / 5) * 5;
    const sectors = mast.siteKind === 'roadside' || mast.siteKind === 'hamlet' ? 2 : 3;
    operators.forEach((operatorId, slot) => {
      const seq = (nodeSeq.get(operatorId) ?? 0) + 1;
      nodeSeq.set(operatorId, seq);
      const lteGroup = takeGroup(operatorId, 'lte');
      const nrGroup = takeGroup(operatorId, 'nr');
      const antennaHeightM = Math.max(6, mast.structureHeightM - 1.5 - slot * 3);
      chooseLayers(mast.siteKind, operatorId, random).forEach((layer, layerIndex) => {
        const carrier = SPECTRUM[operatorId]![layer]!;
        const band = getBand(carrier.tech, carrier.band).band;
        const info = lookupChannel(carrier.tech, carrier.channel, { band });
        for (let s = 0; s < sectors; s++) {
          const azimuth = (rotation + (sectors === 3 ? 120 : 180) * s) % 360;
          const localId = layerIndex * 10 + s + 1;
          const cellIdentity =
            carrier.tech === 'lte'
              ? (10_000 * operatorId + seq) * 256 + localId // ECI = eNB ID·256 + cell ID
              : (100_000 * operatorId + seq) * 4096 + localId; // NCI with a 24-bit gNB ID
          cells.push({
            id: cells.length + 1,
            mastId: mast.id,
            operatorId,
            tech: carrier.tech,
            band,
            channel: carrier.channel,
            dlMhz: info.dlMhz,
            pci: 3 * (carrier.tech === 'lte' ? lteGroup : nrGroup) + s,
            cellIdentity,
            sectorAzimuthDeg: azimuth,
            antennaHeightM,
            bandwidthMhz: carrier.bandwidthMhz,
            rsPowerDbm: carrier.rsPowerDbm,
            biasDb: Math.round(Math.max(-6, Math.min(6, random.normal(0, 2.5))) * 10) / 10,
          });
        }
      });
    });
  }
  return cells;
}
