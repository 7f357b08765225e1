import 'maplibre-gl/dist/maplibre-gl.css';
import { useEffect, useRef, useState } from 'react';
import Map, { Marker, NavigationControl, type MapRef } from 'react-map-gl/maplibre';
import type { StyleSpecification } from 'maplibre-gl';
import { buildBasemapStyle } from '../map/map-style';
import { loadLabelFonts } from '../map/label-fonts';

export interface LatLon {
  lat: number;
  lon: number;
}

interface Props {
  position: LatLon | null;
  /** Where to look before there is a position. */
  fallbackCenter: LatLon;
  onPick: (p: LatLon) => void;
}

/** A small map: a click places the marker, dragging moves it. */
export default function PositionMap({ position, fallbackCenter, onPick }: Props) {
  const mapRef = useRef<MapRef>(null);
  const [style, setStyle] = useState<StyleSpecification | null>(null);

  useEffect(() => {
    loadLabelFonts()
      .catch(() => undefined)
      .then(() => setStyle(buildBasemapStyle(window.location.origin)));
  }, []);

  useEffect(() => {
    if (position) mapRef.current?.easeTo({ center: [position.lon, position.lat], zoom: Math.max(mapRef.current.getZoom(), 13), duration: 400 });
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [position?.lat, position?.lon]);

  if (!style) return <div className="flex h-full items-center justify-center bg-ink-100 text-sm text-ink-600">Loading the map…</div>;
  const center = position ?? fallbackCenter;
  return (
    <Map
      ref={mapRef}
      mapStyle={style}
      initialViewState={{ longitude: center.lon, latitude: center.lat, zoom: position ? 13 : 9 }}
      style={{ width: '100%', height: '100%' }}
      cursor="crosshair"
      onClick={(e) => onPick({ lat: e.lngLat.lat, lon: e.lngLat.lng })}
      attributionControl={false}
    >
      <NavigationControl position="top-right" showCompass={false} />
      {position && (
        <Marker longitude={position.lon} latitude={position.lat} anchor="bottom" draggable onDragEnd={(e) => onPick({ lat: e.lngLat.lat, lon: e.lngLat.lng })}>
          <svg width="34" height="44" viewBox="0 0 34 44" aria-label="Sighting position" role="img">
            <path d="M17 43 C17 43 3 26 3 16 a14 14 0 0 1 28 0 C31 26 17 43 17 43z" fill="#d9891a" stroke="#1f3043" strokeWidth="2" />
            <circle cx="17" cy="16" r="5" fill="#ffffff" />
          </svg>
        </Marker>
      )}
    </Map>
  );
}
