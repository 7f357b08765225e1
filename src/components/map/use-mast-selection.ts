import { useCallback, useEffect, useState, type RefObject } from 'react';
import type { MapRef } from 'react-map-gl/maplibre';
import { readMapUrl, writeMapUrl } from '../../lib/client/map-url';
import type { CameraView } from '../../lib/client/map-view-state';

function cameraOf(map: MapRef | null): CameraView | null {
  if (!map) return null;
  const c = map.getCenter();
  return { longitude: c.lng, latitude: c.lat, zoom: map.getZoom() };
}

function urlWith(state: Parameters<typeof writeMapUrl>[1]): string {
  return `${window.location.pathname}${writeMapUrl(window.location.search, state)}`;
}

/**
 * The selected mast, kept in the URL with the view: selecting or closing a mast is a new history
 * entry, every finished move updates the current one, and Back (or a reload) restores both.
 */
export function useMastSelection(mapRef: RefObject<MapRef | null>): {
  selectedId: string | null;
  select: (id: string | null) => void;
  recordView: () => void;
} {
  const [selectedId, setSelectedId] = useState<string | null>(() => readMapUrl(window.location.search).mastId);

  const select = useCallback(
    (id: string | null) => {
      setSelectedId(id);
      const now = readMapUrl(window.location.search);
      if (now.mastId === id) return;
      window.history.pushState(null, '', urlWith({ mastId: id, view: cameraOf(mapRef.current) ?? now.view }));
    },
    [mapRef],
  );

  const recordView = useCallback(() => {
    const view = cameraOf(mapRef.current);
    if (!view) return;
    const url = urlWith({ mastId: readMapUrl(window.location.search).mastId, view });
    if (url !== `${window.location.pathname}${window.location.search}`) window.history.replaceState(null, '', url);
  }, [mapRef]);

  useEffect(() => {
    const onPop = () => {
      const back = readMapUrl(window.location.search);
      setSelectedId(back.mastId);
      if (back.view) mapRef.current?.jumpTo({ center: [back.view.longitude, back.view.latitude], zoom: back.view.zoom });
    };
    window.addEventListener('popstate', onPop);
    return () => window.removeEventListener('popstate', onPop);
  }, [mapRef]);

  return { selectedId, select, recordView };
}
