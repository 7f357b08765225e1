// Small derivations the map draws from loaded data. Pure.
import type { FeatureCollection } from 'geojson';
import type { RegionJson } from '../../lib/schemas/regions';

/** Region outlines as a GeoJSON source (numeric feature ids for hover state). */
export function regionFeatures(regions: readonly RegionJson[]): FeatureCollection {
  return {
    type: 'FeatureCollection',
    features: regions.map((r) => ({ type: 'Feature', id: Number(r.id), geometry: r.geometry, properties: { id: r.id, name: r.name } })),
  };
}

/** Band names in a reader's order: lettered bands (B3) by number, then NR (n78), then bare numbers, then anything else. */
export function sortBands(bands: Iterable<string>): string[] {
  const key = (b: string) => {
    const m = /^([A-Za-z]*)(\d+)(.*)$/.exec(b);
    return m ? `${m[1].toLowerCase() === 'n' ? '1' : m[1] ? '0' : '2'}${m[2].padStart(5, '0')}${m[3]}` : `3${b}`;
  };
  return [...bands].sort((a, b) => key(a).localeCompare(key(b)));
}

/** The bands named in mast features' comma-separated `bands` property. */
export function bandsOf(features: Iterable<{ properties?: Record<string, unknown> | null }>): Set<string> {
  const seen = new Set<string>();
  for (const f of features) for (const b of String(f.properties?.bands ?? '').split(',')) if (b.trim()) seen.add(b.trim());
  return seen;
}
