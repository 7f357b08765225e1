// Speed of the hot domain paths (pure, no database), one row each in the benchmark report.
import { performance } from 'node:perf_hooks';
import { analysePathProfile, type ProfileSample } from '../../src/lib/domain/terrain';
import { evaluateCandidate, rankShortlist, type CandidateCell, type Kit } from '../../src/lib/domain/shortlist';
import { getDestination } from '../../src/lib/domain/geodesy';
import { lookupChannel } from '../../src/lib/domain/channels';
import { sampleElevationProfile, type ElevationGrid } from '../../src/lib/domain/elevation-grid';
import { DEMO_ANTENNAS, DEMO_CABLES } from '../../seeds/05_demo_catalogue';

export interface Result {
  name: string;
  perOpUs: number;
  targetUs: number;
}

function bench(name: string, targetUs: number, iterations: number, fn: (i: number) => void): Result {
  for (let i = 0; i < Math.min(200, iterations); i++) fn(i); // warm-up
  const start = performance.now();
  for (let i = 0; i < iterations; i++) fn(i);
  const perOpUs = ((performance.now() - start) * 1000) / iterations;
  return { name, perOpUs, targetUs };
}

const customer = { lat: -47.2, lon: -128.5 };
const profile: ProfileSample[] = Array.from({ length: 401 }, (_, i) => ({ distanceM: i * 25, groundM: 100 + 40 * Math.sin(i / 30) }));
// The demo catalogue's panel and 6 mm feeder.
const [panel] = DEMO_ANTENNAS;
const kit: Kit = { antenna: { id: 'a', ...panel! }, cable: { id: 'c', ...DEMO_CABLES[1]! }, cableM: 10, mountHeightM: 6 };
const cells: CandidateCell[] = Array.from({ length: 60 }, (_, i) => ({
  cellId: String(i),
  mastId: String(i),
  mastName: `M${i}`,
  mastPosition: getDestination(customer, 2000 + i * 500, (i * 37) % 360),
  mastGroundM: 120,
  operatorId: String(i % 3),
  operatorName: 'Op',
  tech: 'lte',
  band: 'B20',
  channel: 6300,
  dlMhz: 806,
  pci: i,
  sectorAzimuthDeg: (i * 120) % 360,
  antennaHeightM: 30,
  rsPowerDbm: 15.2,
}));
const W = 773;
const H = 389;
const grid: ElevationGrid = {
  west: -128.8,
  south: -47.35,
  east: -128.8 + (W - 1) / 1200,
  north: -47.35 + (H - 1) / 1200,
  width: W,
  height: H,
  registration: 'point',
  nodata: -32768,
  values: Float32Array.from({ length: W * H }, (_, i) => 100 + (i % 97)),
};

export function runDomainBenchmarks(): Result[] {
  return [
    bench('terrain analysis, 401 samples', 500, 2000, () => analysePathProfile({ samples: profile, txHeightM: 6, rxHeightM: 30, freqMhz: 806 })),
    bench('elevation profile, 400 samples', 1500, 1000, (i) =>
      sampleElevationProfile([grid], customer, getDestination(customer, 10_000, i % 360), { maxSamples: 400 }),
    ),
    bench('evaluate + rank 60 candidates', 50_000, 50, () =>
      rankShortlist(
        cells.map((c) =>
          evaluateCandidate(c, { profile, calibration: null }, { customer, customerGroundM: 100, date: new Date('2026-06-01'), kit, currentKit: null }),
        ),
      ),
    ),
    bench('channel lookup', 20, 20_000, (i) => lookupChannel('lte', 6150 + (i % 300))),
  ];
}
