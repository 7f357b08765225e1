// Drive-survey readings along the demo roads. Each value follows from the cells: the same link budget
// the shortlist uses (link-budget.ts predictRsrp: free space, single knife-edge terrain diffraction from
// terrain.ts, sector pattern) plus a clutter term from the land cover, each cell's hidden bias, and
// spatially correlated shadowing with some fast-fading noise. So the readings disagree with the
// plain model in ways calibration can learn (per-cell offsets), and not only by noise.
import { predictRsrp } from '../domain/link-budget';
import { getMeasurementRange, getNrResourceBlockCount, getLteResourceBlockCount, getRsrqDb, getThermalNoiseDbm } from '../domain/measurements';
import { analysePathProfile, type ProfileSample } from '../domain/terrain';
import type { LanduseArea, Road } from './basemap';
import type { DemoCellPlan, DemoMastPlan } from './network';
import { createValueNoise } from './noise';
import { bearingDeg, distanceKm, isInRing, samplePolyline, type LocalPoint } from './projection';
import { hashString, type Random } from './random';

export interface ReadingPlan {
  takenAt: Date;
  at: LocalPoint;
  tech: 'lte' | 'nr';
  channel: number;
  pci: number;
  rsrpDbm: number;
  rsrqDb: number;
  sinrDb: number;
  rssiDbm: number;
  /** The cell that served the reading; null for the few readings left unmatched on purpose. */
  cellId: number | null;
  device: string;
  source: string;
}

/** Receiver: a survey handset's external antenna on a vehicle roof. */
export const SURVEY_ANTENNA_HEIGHT_M = 1.5;
export const SURVEY_ANTENNA_GAIN_DBI = 0;

/** Ground-level excess loss on every path, plus extra by land cover at the receiver — common-practice magnitudes. */
const BASE_EXCESS_DB = 8;
const CLUTTER_DB: Record<LanduseArea['kind'], number> = { residential: 6, wood: 8, farmland: 0, moor: 0 };
/** Fraction of resource elements loaded on neighbouring cells and on the serving cell's data REs. */
const NEIGHBOUR_LOAD = 0.5;
const SERVING_LOAD = 0.6;
const NOISE_FIGURE_DB = 7;
const MAX_RANGE_KM = 22;
const NO_SERVICE_DBM = -124;

const SURVEY_START_UTC = Date.UTC(2026, 9, 5, 8, 30); // 5 Oct 2026, 08:30 UTC
const DRIVE_SPEED_KMH = 40;

export interface ReadingOptions {
  stepKm: number;
  unmatchedShare: number;
}

interface MastPath {
  dKm: number;
  profile: ProfileSample[];
  lossByKey: Map<number, number>;
}

interface Link {
  cell: DemoCellPlan;
  rsrpDbm: number;
}

export function createReadings(
  masts: DemoMastPlan[],
  cells: DemoCellPlan[],
  roads: Road[],
  landuse: LanduseArea[],
  groundAt: (p: LocalPoint) => number,
  random: Random,
  options: ReadingOptions = { stepKm: 0.2, unmatchedShare: 0.03 },
): ReadingPlan[] {
  const mastById = new Map(masts.map((m) => [m.id, m]));
  const liveCells = cells.filter((c) => mastById.get(c.mastId)?.status === 'active');
  const operatorIds = [...new Set(liveCells.map((c) => c.operatorId))].sort((a, b) => a - b);
  const cellsByOperatorTech = new Map<string, DemoCellPlan[]>();
  for (const c of liveCells) {
    const key = `${c.operatorId}:${c.tech}`;
    cellsByOperatorTech.set(key, [...(cellsByOperatorTech.get(key) ?? []), c]);
  }
  const shadowNoise = createValueNoise(hashString(`shadowing:${random.next()}`));
  const readings: ReadingPlan[] = [];

  const clutterAt = (p: LocalPoint) => {
    let db = 0;
    for (const area of landuse) if (CLUTTER_DB[area.kind] > db && isInRing(p, area.ring)) db = CLUTTER_DB[area.kind];
    return BASE_EXCESS_DB + db;
  };

  // One terrain profile per mast and point; the diffraction loss per antenna height and frequency.
  const diffraction = (path: MastPath, antennaHeightM: number, freqMhz: number) => {
    const key = Math.round(antennaHeightM * 10) * 1e6 + Math.round(freqMhz * 100);
    let loss = path.lossByKey.get(key);
    if (loss === undefined) {
      loss = analysePathProfile({ samples: path.profile, txHeightM: antennaHeightM, rxHeightM: SURVEY_ANTENNA_HEIGHT_M, freqMhz }).diffractionLossDb;
      path.lossByKey.set(key, loss);
    }
    return loss;
  };

  const profileFor = (mast: DemoMastPlan, p: LocalPoint, dKm: number): ProfileSample[] => {
    const n = Math.max(2, Math.min(60, Math.ceil(dKm / 0.25)));
    const samples: ProfileSample[] = [];
    for (let i = 0; i <= n; i++) {
      const t = i / n;
      samples.push({
        distanceM: t * dKm * 1000,
        groundM: Math.max(0, groundAt({ x: mast.at.x + t * (p.x - mast.at.x), y: mast.at.y + t * (p.y - mast.at.y) })),
      });
    }
    return samples;
  };

  const measure = (p: LocalPoint, clutterDb: number, cellsHere: DemoCellPlan[], profiles: Map<number, MastPath>): Link[] => {
    const links: Link[] = [];
    for (const cell of cellsHere) {
      const mast = mastById.get(cell.mastId)!;
      const path = profiles.get(mast.id);
      if (!path) continue;
      const offset = ((((bearingDeg(mast.at, p) - cell.sectorAzimuthDeg) % 360) + 540) % 360) - 180;
      const prediction = predictRsrp({
        freqMhz: cell.dlMhz,
        distanceM: Math.max(30, path.dKm * 1000),
        rsEpreDbm: cell.rsPowerDbm,
        sectorOffsetDeg: offset,
        diffractionLossDb: diffraction(path, cell.antennaHeightM, cell.dlMhz),
        excessLossDb: clutterDb,
        customerGainDbi: SURVEY_ANTENNA_GAIN_DBI,
      });
      const shadowDb = 5 * shadowNoise(p.x / 0.35 + cell.id * 7.31, p.y / 0.35 - cell.id * 3.17);
      links.push({ cell, rsrpDbm: prediction.rsrpDbm + cell.biasDb + shadowDb + random.normal(0, 1.5) });
    }
    return links;
  };

  roads
    .filter((road) => road.kind !== 'track')
    .forEach((road, roadIndex) => {
      const dayStart = SURVEY_START_UTC + roadIndex * 86_400_000;
      for (const sample of samplePolyline(road.line, options.stepKm)) {
        const p = { x: sample.x + random.normal(0, 0.004), y: sample.y + random.normal(0, 0.004) };
        const takenAt = new Date(dayStart + Math.round((sample.chainageKm / DRIVE_SPEED_KMH) * 3_600_000));
        const clutterDb = clutterAt(p);
        const profiles = new Map<number, MastPath>();
        for (const mast of masts) {
          if (mast.status !== 'active') continue;
          const dKm = distanceKm(mast.at, p);
          if (dKm <= MAX_RANGE_KM) profiles.set(mast.id, { dKm, profile: profileFor(mast, p, dKm), lossByKey: new Map() });
        }
        operatorIds.forEach((operatorId, opIndex) => {
          for (const tech of ['lte', 'nr'] as const) {
            const candidates = cellsByOperatorTech.get(`${operatorId}:${tech}`) ?? [];
            if (candidates.length === 0) continue;
            const links = measure(p, clutterDb, candidates, profiles);
            if (links.length === 0) continue;
            const best = links.reduce((a, b) => (b.rsrpDbm > a.rsrpDbm ? b : a));
            if (best.rsrpDbm < NO_SERVICE_DBM) continue;
            readings.push({
              ...describeSignal(best, links, tech),
              takenAt: new Date(takenAt.getTime() + opIndex * 1000),
              at: p,
              tech,
              channel: best.cell.channel,
              pci: best.cell.pci,
              cellId: random.chance(options.unmatchedShare) ? null : best.cell.id,
              device: `survey-kit-${opIndex + 1}`,
              source: 'drive-survey',
            });
          }
        });
      }
    });
  return readings;
}

const dbmToMw = (dbm: number) => 10 ** (dbm / 10);
const mwToDbm = (mw: number) => 10 * Math.log10(mw);
const clamp = (v: number, min: number, max: number) => Math.min(max, Math.max(min, v));
const roundTo = (v: number, step: number) => Math.round(v / step) * step;

/** RSRP, RSRQ, SINR and RSSI of the serving link with co-channel neighbours as interference. */
function describeSignal(best: Link, links: Link[], tech: 'lte' | 'nr'): Pick<ReadingPlan, 'rsrpDbm' | 'rsrqDb' | 'sinrDb' | 'rssiDbm'> {
  const cell = best.cell;
  const scsKhz = tech === 'nr' && cell.bandwidthMhz > 50 ? 30 : 15;
  const resourceBlocks = tech === 'lte' ? getLteResourceBlockCount(cell.bandwidthMhz) : getNrResourceBlockCount(cell.bandwidthMhz, scsKhz);
  const noiseMw = dbmToMw(getThermalNoiseDbm(scsKhz * 1000, NOISE_FIGURE_DB));
  const signalMw = dbmToMw(best.rsrpDbm);
  const interferenceMw = links.filter((l) => l !== best && l.cell.channel === cell.channel).reduce((sum, l) => sum + NEIGHBOUR_LOAD * dbmToMw(l.rsrpDbm), 0);
  const sinrDb = mwToDbm(signalMw / (interferenceMw + noiseMw));
  const rssiDbm = mwToDbm(12 * resourceBlocks * (SERVING_LOAD * signalMw + interferenceMw + noiseMw));
  const rsrpRange = getMeasurementRange(tech === 'lte' ? 'lteRsrp' : 'nrSsRsrp');
  const rsrqRange = getMeasurementRange(tech === 'lte' ? 'lteRsrq' : 'nrSsRsrq');
  const sinrRange = getMeasurementRange(tech === 'lte' ? 'lteSinr' : 'nrSsSinr');
  const rsrpDbm = clamp(Math.round(best.rsrpDbm), rsrpRange.min, rsrpRange.max);
  return {
    rsrpDbm,
    rsrqDb: clamp(roundTo(getRsrqDb(best.rsrpDbm, rssiDbm, resourceBlocks), 0.5), rsrqRange.min, rsrqRange.max),
    sinrDb: clamp(roundTo(sinrDb, 0.5), sinrRange.min, sinrRange.max),
    rssiDbm: Math.round(rssiDbm),
  };
}
