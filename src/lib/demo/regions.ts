// Service regions of the demo: three sectors of the island meeting at an inland point, each
// reaching a little offshore so the whole coast belongs to one of them.
import { fromPolar, type IslandModel } from './geography';
import type { LocalPoint } from './projection';

export interface RegionPlan {
  name: string;
  ring: LocalPoint[];
}

const REGION_SECTORS = [
  { name: 'Ulvenholm Shore', from: 30, to: 150 },
  { name: 'Heskeld Fells', from: 150, to: 262 },
  { name: 'Tessary Coast', from: 262, to: 390 },
];

export function createRegions(model: IslandModel): RegionPlan[] {
  const apex = fromPolar(model.shape, { theta: 200, rho: 0.08 });
  return REGION_SECTORS.map((s) => {
    const ring: LocalPoint[] = [apex];
    for (let theta = s.from; theta <= s.to; theta += 4) ring.push(fromPolar(model.shape, { theta: theta % 360, rho: 1.12 }));
    const end = fromPolar(model.shape, { theta: s.to % 360, rho: 1.12 });
    const last = ring[ring.length - 1]!;
    if (last.x !== end.x || last.y !== end.y) ring.push(end);
    ring.push({ ...apex });
    return { name: s.name, ring };
  });
}
