// The whole demo scenario as plain data (GeoJSON geometry, WGS84), generated deterministically
// from one seed: the island's basemap, operators, masts, cells, drive-survey readings and regions.
// Pure: no I/O, no clock; the seed files insert it.
import type { LineString, MultiPolygon, Point, Polygon } from 'geojson';
import { createIslandModel, DEMO_SEED, type IslandModel } from './geography';
import { createElevationFn, getIslandBounds, type ElevationFn, type GeoBounds } from './elevation';
import {
  createLanduse,
  createPlaceLabels,
  createRoads,
  listNearestRoadPoints,
  routeRoad,
  type LanduseKind,
  type PlaceLabelKind,
  type Road,
  type RoadKind,
} from './basemap';
import { createNetwork, DEMO_OPERATORS, type DemoCellPlan, type DemoOperatorSpec, type MastStatus, type SiteKind, type StructureType } from './network';
import { createReadings, type ReadingPlan } from './readings';
import { createRegions } from './regions';
import { round6, toGeo, toPosition, type LocalPoint } from './projection';
import { createRandom } from './random';

export interface DemoMast {
  id: number;
  name: string;
  reference: string;
  lat: number;
  lon: number;
  groundElevationM: number;
  structureHeightM: number;
  structureType: StructureType;
  status: MastStatus;
  accessNotes: string | null;
  siteKind: SiteKind;
}

/** A planned cell as stored; `biasDb` stays in the readings, not in the database. */
export interface DemoCell extends DemoCellPlan {
  lastObservedAt: Date | null;
}

/** A planned reading placed in WGS84. */
export interface DemoReading extends Omit<ReadingPlan, 'at'> {
  lat: number;
  lon: number;
}

export interface DemoFeature<G, K extends string> {
  name: string | null;
  kind: K;
  geometry: G;
}

export interface DemoBasemap {
  land: Array<DemoFeature<MultiPolygon, 'island'>>;
  water: Array<DemoFeature<Polygon | LineString, 'lake' | 'river' | 'stream'>>;
  roads: Array<DemoFeature<LineString, RoadKind> & { ref: string | null }>;
  places: Array<DemoFeature<Point, PlaceLabelKind> & { rank: number; population: number | null; eleM: number | null }>;
  landuse: Array<DemoFeature<Polygon, LanduseKind>>;
}

export interface DemoScenario {
  seed: number;
  island: {
    name: string;
    centre: { lat: number; lon: number };
    bounds: GeoBounds;
    /** A zoom (Web Mercator, 512 px tiles as MapLibre counts) that shows the whole island in a ~1000 px wide map. */
    initialZoom: number;
  };
  operators: DemoOperatorSpec[];
  masts: DemoMast[];
  cells: DemoCell[];
  readings: DemoReading[];
  regions: Array<{ name: string; geometry: MultiPolygon }>;
  basemap: DemoBasemap;
}

const LAST_SITE_VISIT_UTC = Date.UTC(2026, 8, 22, 11, 0); // 22 Sep 2026

const ring = (points: LocalPoint[]) => points.map(toPosition);

/** Elevation sampled once on a 100 m local grid, then looked up bilinearly (fast terrain profiles). */
function createGroundLookup(elevation: ElevationFn, model: IslandModel): (p: LocalPoint) => number {
  const xs = model.coastline.map((p) => p.x);
  const ys = model.coastline.map((p) => p.y);
  const minX = Math.floor(Math.min(...xs)) - 2;
  const minY = Math.floor(Math.min(...ys)) - 2;
  const step = 0.1;
  const cols = Math.ceil((Math.max(...xs) + 2 - minX) / step) + 1;
  const rows = Math.ceil((Math.max(...ys) + 2 - minY) / step) + 1;
  const values = new Float32Array(cols * rows);
  for (let r = 0; r < rows; r++) for (let c = 0; c < cols; c++) values[r * cols + c] = elevation({ x: minX + c * step, y: minY + r * step });
  return (p) => {
    const fc = Math.min(cols - 1.000001, Math.max(0, (p.x - minX) / step));
    const fr = Math.min(rows - 1.000001, Math.max(0, (p.y - minY) / step));
    const c0 = Math.floor(fc);
    const r0 = Math.floor(fr);
    const tc = fc - c0;
    const tr = fr - r0;
    const v = (r: number, c: number) => values[r * cols + c]!;
    const a = v(r0, c0) + tc * (v(r0, c0 + 1) - v(r0, c0));
    const b = v(r0 + 1, c0) + tc * (v(r0 + 1, c0 + 1) - v(r0 + 1, c0));
    return a + tr * (b - a);
  };
}

/** Access tracks from the nearest road that can reach each hilltop mast over dry land. */
function createMastTracks(model: IslandModel, roads: Road[], hilltops: LocalPoint[], seed: number): Road[] {
  const random = createRandom(seed).fork('tracks');
  const tracks: Road[] = [];
  for (const at of hilltops) {
    for (const from of listNearestRoadPoints(roads, at).slice(0, 40)) {
      const line = routeRoad(model, random, from, at, 0.15);
      if (line) {
        tracks.push({ name: null, ref: null, kind: 'track', line });
        break;
      }
    }
  }
  return tracks;
}

export function generateDemoScenario(seed = DEMO_SEED): DemoScenario {
  const random = createRandom(seed);
  const model = createIslandModel(seed);
  const elevation = createElevationFn(model);
  const roads = createRoads(model, random.fork('roads'));
  const landuse = createLanduse(model, elevation, random.fork('landuse'));
  const network = createNetwork(model, elevation, roads, random.fork('network'));
  const tracks = createMastTracks(
    model,
    roads,
    network.masts.filter((m) => m.siteKind === 'hilltop').map((m) => m.at),
    seed,
  );
  const ground = createGroundLookup(elevation, model);
  const readingPlans = createReadings(network.masts, network.cells, roads, landuse, ground, random.fork('readings'));

  const lastSeen = new Map<number, number>();
  for (const r of readingPlans) {
    if (r.cellId !== null) lastSeen.set(r.cellId, Math.max(lastSeen.get(r.cellId) ?? 0, r.takenAt.getTime()));
  }

  const bounds = getIslandBounds(model);
  const centre = toGeo({ x: 0, y: 0 });

  return {
    seed,
    island: {
      name: model.name,
      centre: { lat: round6(centre.lat), lon: round6(centre.lon) },
      bounds: { west: round6(bounds.west), south: round6(bounds.south), east: round6(bounds.east), north: round6(bounds.north) },
      initialZoom: 10,
    },
    operators: DEMO_OPERATORS,
    masts: network.masts.map((m) => {
      const [lon, lat] = toPosition(m.at);
      return {
        id: m.id,
        name: m.name,
        reference: m.reference,
        lat,
        lon,
        groundElevationM: m.groundElevationM,
        structureHeightM: m.structureHeightM,
        structureType: m.structureType,
        status: m.status,
        accessNotes: m.accessNotes,
        siteKind: m.siteKind,
      };
    }),
    cells: network.cells.map((c) => ({
      id: c.id,
      mastId: c.mastId,
      operatorId: c.operatorId,
      tech: c.tech,
      band: c.band,
      channel: c.channel,
      dlMhz: c.dlMhz,
      pci: c.pci,
      cellIdentity: c.cellIdentity,
      sectorAzimuthDeg: c.sectorAzimuthDeg,
      antennaHeightM: c.antennaHeightM,
      bandwidthMhz: c.bandwidthMhz,
      rsPowerDbm: c.rsPowerDbm,
      lastObservedAt: new Date(lastSeen.get(c.id) ?? LAST_SITE_VISIT_UTC),
      biasDb: c.biasDb,
    })),
    readings: readingPlans.map((r) => {
      const [lon, lat] = toPosition(r.at);
      return {
        takenAt: r.takenAt,
        lat,
        lon,
        tech: r.tech,
        channel: r.channel,
        pci: r.pci,
        rsrpDbm: r.rsrpDbm,
        rsrqDb: r.rsrqDb,
        sinrDb: r.sinrDb,
        rssiDbm: r.rssiDbm,
        cellId: r.cellId,
        device: r.device,
        source: r.source,
      };
    }),
    regions: createRegions(model).map((r) => ({ name: r.name, geometry: { type: 'MultiPolygon', coordinates: [[ring(r.ring)]] } })),
    basemap: {
      land: [{ name: `${model.name} Island`, kind: 'island', geometry: { type: 'MultiPolygon', coordinates: [[ring(model.coastline)]] } }],
      water: [
        ...model.lakes.map((l) => ({ name: l.name, kind: 'lake' as const, geometry: { type: 'Polygon' as const, coordinates: [ring(l.ring)] } })),
        ...model.rivers.map((r) => ({ name: r.name, kind: r.kind, geometry: { type: 'LineString' as const, coordinates: ring(r.line) } })),
      ],
      roads: [...roads, ...tracks].map((r) => ({ name: r.name, ref: r.ref, kind: r.kind, geometry: { type: 'LineString', coordinates: ring(r.line) } })),
      places: createPlaceLabels(model, elevation).map((p) => ({
        name: p.name,
        kind: p.kind,
        rank: p.rank,
        population: p.population,
        eleM: p.eleM,
        geometry: { type: 'Point', coordinates: toPosition(p.at) },
      })),
      landuse: landuse.map((a) => ({ name: a.name, kind: a.kind, geometry: { type: 'Polygon', coordinates: [ring(a.ring)] } })),
    },
  };
}
