import { useCallback, useState, type RefObject } from 'react';
import type { MapRef } from 'react-map-gl/maplibre';
import { MAST_SOURCE_ID, MAST_SOURCE_LAYER } from './layers';
import { bandsOf, sortBands } from './map-data';

/** The bands of every mast loaded so far (for the band filter); `collect` runs when the map is idle. */
export function useSeenBands(mapRef: RefObject<MapRef | null>): { bands: string[]; collect: () => void } {
  const [bands, setBands] = useState<string[]>([]);
  const collect = useCallback(() => {
    const map = mapRef.current?.getMap();
    if (!map || !map.getSource(MAST_SOURCE_ID)) return;
    const seen = bandsOf(map.querySourceFeatures(MAST_SOURCE_ID, { sourceLayer: MAST_SOURCE_LAYER }));
    setBands((prev) => {
      const next = new Set([...prev, ...seen]);
      return next.size === prev.length ? prev : sortBands(next);
    });
  }, [mapRef]);
  return { bands, collect };
}
