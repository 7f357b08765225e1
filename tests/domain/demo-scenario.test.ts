import { beforeAll, describe, expect, it } from 'vitest';
import { generateDemoScenario, type DemoScenario } from '../../src/lib/demo';
import { DEMO_SEED, getNormalisedRadius, isOnLand } from '../../src/lib/demo/geography';
import { getDemoElevationM, getDemoIsland } from '../../src/lib/demo/elevation';
import { toLocal } from '../../src/lib/demo/projection';
import { getDistanceM } from '../../src/lib/domain/geodesy';
import { isChannelInBand, lookupChannel } from '../../src/lib/domain/channels';
import { OPERATOR_PALETTE } from '../../src/lib/schemas/operators';

let scenario: DemoScenario;

beforeAll(() => {
  scenario = generateDemoScenario();
});

const median = (values: number[]) => {
  const s = [...values].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)]!;
};

describe('demo scenario: determinism', () => {
  it('is the same on every run with the demo seed', () => {
    const again = generateDemoScenario(DEMO_SEED);
    expect(JSON.stringify(again)).toBe(JSON.stringify(scenario));
  });

  it('changes with another seed', () => {
    const other = generateDemoScenario(DEMO_SEED + 1);
    expect(other.masts.map((m) => [m.lat, m.lon])).not.toEqual(scenario.masts.map((m) => [m.lat, m.lon]));
  });
});

describe('demo scenario: the island', () => {
  it('lies in open sea in the South Pacific, about 40 × 30 km', () => {
    const { bounds, centre } = scenario.island;
    expect(centre).toEqual({ lat: -47.2, lon: -128.5 });
    // An empty box of ocean far from any land (checked by hand, not by a library).
    expect(bounds.south).toBeGreaterThan(-48);
    expect(bounds.north).toBeLessThan(-46.5);
    expect(bounds.west).toBeGreaterThan(-129.5);
    expect(bounds.east).toBeLessThan(-127.5);
    const widthKm = getDistanceM({ lat: centre.lat, lon: bounds.west }, { lat: centre.lat, lon: bounds.east }) / 1000;
    const heightKm = getDistanceM({ lat: bounds.south, lon: centre.lon }, { lat: bounds.north, lon: centre.lon }) / 1000;
    expect(widthKm).toBeGreaterThan(35);
    expect(widthKm).toBeLessThan(50);
    expect(heightKm).toBeGreaterThan(24);
    expect(heightKm).toBeLessThan(36);
  });

  it('has hills, valleys and sea around it', () => {
    const peaks = scenario.basemap.places.filter((p) => p.kind === 'peak');
    expect(Math.max(...peaks.map((p) => p.eleM ?? 0))).toBeGreaterThan(500);
    expect(getDemoElevationM(-47.2, -129.2)).toBeLessThan(0);
    for (const p of peaks) {
      const [lon, lat] = p.geometry.coordinates as [number, number];
      expect(Math.abs(getDemoElevationM(lat, lon) - p.eleM!)).toBeLessThan(1);
    }
    const lake = scenario.basemap.water.find((w) => w.kind === 'lake')!;
    expect(lake).toBeDefined();
    expect(scenario.basemap.water.filter((w) => w.kind === 'river').length).toBeGreaterThanOrEqual(2);
  });

  it('joins every town, village and hamlet by road', () => {
    const settlements = scenario.basemap.places.filter((p) => ['town', 'village', 'hamlet'].includes(p.kind));
    expect(settlements.length).toBeGreaterThanOrEqual(12);
    const roadPoints = scenario.basemap.roads.filter((r) => r.kind !== 'track').flatMap((r) => r.geometry.coordinates);
    for (const s of settlements) {
      const [lon, lat] = s.geometry.coordinates as [number, number];
      const nearest = Math.min(...roadPoints.map(([x, y]) => getDistanceM({ lat, lon }, { lat: y!, lon: x! })));
      expect(nearest, s.name ?? undefined).toBeLessThan(50);
    }
  });

  it('keeps roads on dry land', () => {
    const model = getDemoIsland();
    for (const road of scenario.basemap.roads) {
      for (const [lon, lat] of road.geometry.coordinates) expect(isOnLand(model, toLocal({ lat: lat!, lon: lon! })), road.name ?? 'track').toBe(true);
    }
  });
});

describe('demo scenario: operators, masts and cells', () => {
  it('has three operators on the test network code MCC 001 with distinct colour-blind-safe colours', () => {
    expect(scenario.operators.map((o) => [o.id, o.mcc, o.mnc])).toEqual([
      [1, '001', '01'],
      [2, '001', '02'],
      [3, '001', '03'],
    ]);
    const colours = scenario.operators.map((o) => o.colour);
    expect(new Set(colours).size).toBe(3);
    for (const c of colours) expect(OPERATOR_PALETTE).toContain(c);
  });

  it('places about 40 masts on land with plausible ground elevations', () => {
    const model = getDemoIsland();
    expect(scenario.masts).toHaveLength(40);
    for (const m of scenario.masts) {
      expect(isOnLand(model, toLocal(m)), m.name).toBe(true);
      expect(getNormalisedRadius(model.shape, toLocal(m))).toBeLessThan(1);
      expect(Math.abs(getDemoElevationM(m.lat, m.lon) - m.groundElevationM), m.name).toBeLessThan(1);
      expect(m.groundElevationM).toBeGreaterThan(0);
    }
    const hilltops = scenario.masts.filter((m) => m.siteKind === 'hilltop');
    expect(median(hilltops.map((m) => m.groundElevationM))).toBeGreaterThan(median(scenario.masts.map((m) => m.groundElevationM)));
    expect(new Set(scenario.masts.map((m) => m.reference)).size).toBe(40);
    expect(new Set(scenario.masts.map((m) => m.name)).size).toBe(40);
  });

  it('has a few planned and decommissioned masts, without live cells', () => {
    const planned = scenario.masts.filter((m) => m.status === 'planned');
    const gone = scenario.masts.filter((m) => m.status === 'decommissioned');
    expect(planned.length).toBeGreaterThanOrEqual(2);
    expect(gone.length).toBeGreaterThanOrEqual(1);
    const idle = new Set([...planned, ...gone].map((m) => m.id));
    expect(scenario.cells.filter((c) => idle.has(c.mastId))).toEqual([]);
  });

  it('has about 150 cells across low, mid and high bands, including NR', () => {
    expect(scenario.cells.length).toBeGreaterThanOrEqual(120);
    expect(scenario.cells.length).toBeLessThanOrEqual(200);
    const bands = new Set(scenario.cells.map((c) => c.band));
    for (const band of ['B20', 'B8', 'B3']) expect(bands).toContain(band);
    expect([...bands].some((b) => b === 'B1' || b === 'B7')).toBe(true);
    expect(scenario.cells.some((c) => c.tech === 'nr' && c.band === 'n78')).toBe(true);
    expect(scenario.cells.some((c) => c.tech === 'nr' && c.band === 'n28')).toBe(true);
  });

  // 3GPP TS 36.101 Table 5.7.3-1 (EARFCN) and TS 38.104 Table 5.4.2.3-1 (NR-ARFCN), via channels.ts.
  it('puts every channel inside its band with the downlink frequency of the 3GPP raster', () => {
    for (const c of scenario.cells) {
      expect(isChannelInBand(c.tech, c.channel, c.band), `${c.tech} ${c.channel} ${c.band}`).toBe(true);
      expect(c.dlMhz).toBeCloseTo(lookupChannel(c.tech, c.channel, { band: c.band }).dlMhz, 6);
    }
  });

  // LTE PCI 0–503 (TS 36.211 §6.11), NR PCI 0–1007 (TS 38.211 §7.4.2.1).
  it('keeps PCIs in range and never repeats one on the same operator channel', () => {
    const seen = new Map<string, number>();
    for (const c of scenario.cells) {
      expect(c.pci).toBeGreaterThanOrEqual(0);
      expect(c.pci).toBeLessThanOrEqual(c.tech === 'lte' ? 503 : 1007);
      const key = `${c.operatorId}:${c.channel}:${c.pci}`;
      expect(seen.has(key), key).toBe(false);
      seen.set(key, c.id);
    }
  });

  it('gives 3-sector sites azimuths 120° apart, all within 0–359°', () => {
    const groups = new Map<string, number[]>();
    for (const c of scenario.cells) {
      expect(c.sectorAzimuthDeg).toBeGreaterThanOrEqual(0);
      expect(c.sectorAzimuthDeg).toBeLessThan(360);
      const key = `${c.mastId}:${c.operatorId}:${c.channel}`;
      groups.set(key, [...(groups.get(key) ?? []), c.sectorAzimuthDeg]);
    }
    const threeSector = [...groups.values()].filter((a) => a.length === 3);
    expect(threeSector.length).toBeGreaterThan(20);
    for (const az of threeSector) {
      const s = [...az].sort((a, b) => a - b);
      expect([s[1]! - s[0]!, s[2]! - s[1]!]).toEqual([120, 120]);
    }
  });

  it('mounts antennas below the top of their structure', () => {
    const masts = new Map(scenario.masts.map((m) => [m.id, m]));
    for (const c of scenario.cells) expect(c.antennaHeightM).toBeLessThanOrEqual(masts.get(c.mastId)!.structureHeightM);
  });
});

describe('demo scenario: readings and regions', () => {
  it('has a few thousand readings along the roads, nearly all matched to the cell that sent them', () => {
    expect(scenario.readings.length).toBeGreaterThan(2000);
    expect(scenario.readings.length).toBeLessThan(10000);
    const cells = new Map(scenario.cells.map((c) => [c.id, c]));
    const matched = scenario.readings.filter((r) => r.cellId !== null);
    expect(matched.length / scenario.readings.length).toBeGreaterThan(0.9);
    for (const r of matched) {
      const cell = cells.get(r.cellId!)!;
      expect([r.tech, r.channel, r.pci]).toEqual([cell.tech, cell.channel, cell.pci]);
    }
  });

  // Reporting ranges: LTE RSRP −140…−44 dBm (TS 36.133 Table 9.1.4-1), RSRQ −19.5…−3 dB (Table 9.1.7-1);
  // NR SS-RSRP −156…−31 dBm (TS 38.133 Table 10.1.6.1-1).
  it('reports values inside the 3GPP reporting ranges', () => {
    for (const r of scenario.readings) {
      if (r.tech === 'lte') {
        expect(r.rsrpDbm).toBeGreaterThanOrEqual(-140);
        expect(r.rsrpDbm).toBeLessThanOrEqual(-44);
        expect(r.rsrqDb).toBeGreaterThanOrEqual(-19.5);
        expect(r.rsrqDb).toBeLessThanOrEqual(-3);
      } else {
        expect(r.rsrpDbm).toBeGreaterThanOrEqual(-156);
        expect(r.rsrpDbm).toBeLessThanOrEqual(-31);
      }
      expect(r.rssiDbm).toBeGreaterThan(r.rsrpDbm);
    }
  });

  it('gets weaker with distance from the serving mast, as the cells predict', () => {
    const cells = new Map(scenario.cells.map((c) => [c.id, c]));
    const masts = new Map(scenario.masts.map((m) => [m.id, m]));
    const near: number[] = [];
    const far: number[] = [];
    for (const r of scenario.readings) {
      if (r.cellId === null || r.tech !== 'lte') continue;
      const mast = masts.get(cells.get(r.cellId)!.mastId)!;
      const d = getDistanceM(r, mast);
      if (d < 2000) near.push(r.rsrpDbm);
      if (d > 6000) far.push(r.rsrpDbm);
    }
    expect(near.length).toBeGreaterThan(100);
    expect(far.length).toBeGreaterThan(100);
    expect(median(near) - median(far)).toBeGreaterThan(10);
  });

  it('has two or three named regions covering the island', () => {
    expect(scenario.regions.length).toBeGreaterThanOrEqual(2);
    expect(scenario.regions.length).toBeLessThanOrEqual(3);
    expect(new Set(scenario.regions.map((r) => r.name)).size).toBe(scenario.regions.length);
  });
});
