import 'maplibre-gl/dist/maplibre-gl.css';
import { useEffect, useMemo, useState } from 'react';
import Map, { Layer, NavigationControl, ScaleControl, Source } from 'react-map-gl/maplibre';
import type { StyleSpecification } from 'maplibre-gl';
import type { FeatureCollection } from 'geojson';
import { circle } from '@turf/turf';
import { LABEL_FONTS, buildBasemapStyle } from '../map/map-style';
import { loadLabelFonts } from '../map/label-fonts';
import { SIGHTING_ICON_ID, mastIconImage } from '../map/mast-icons';

export interface ReviewMapMast {
  id: string;
  name: string;
  lat: number;
  lon: number;
  rank: number;
}

interface Props {
  sighting: { lat: number; lon: number };
  masts: ReviewMapMast[];
  radiusM: number;
  selectedMastId: string | null;
  onSelectMast: (id: string) => void;
}

/** The sighting (the pending mark), the search circle, and the nearby masts numbered by rank. */
export default function ReviewMap({ sighting, masts, radiusM, selectedMastId, onSelectMast }: Props) {
  const [style, setStyle] = useState<StyleSpecification | null>(null);
  useEffect(() => {
    loadLabelFonts().then(() => setStyle(buildBasemapStyle(window.location.origin)));
  }, []);

  const ring = useMemo<FeatureCollection>(
    () => ({ type: 'FeatureCollection', features: [circle([sighting.lon, sighting.lat], radiusM / 1000, { steps: 64, units: 'kilometers' })] }),
    [sighting.lat, sighting.lon, radiusM],
  );
  const point = useMemo<FeatureCollection>(
    () => ({
      type: 'FeatureCollection',
      features: [{ type: 'Feature', properties: {}, geometry: { type: 'Point', coordinates: [sighting.lon, sighting.lat] } }],
    }),
    [sighting.lat, sighting.lon],
  );
  const mastPoints = useMemo<FeatureCollection>(
    () => ({
      type: 'FeatureCollection',
      features: masts.map((m) => ({
        type: 'Feature',
        properties: { id: m.id, label: String(m.rank), name: m.name, selected: m.id === selectedMastId },
        geometry: { type: 'Point', coordinates: [m.lon, m.lat] },
      })),
    }),
    [masts, selectedMastId],
  );

  if (!style) return <div className="flex h-full items-center justify-center bg-ink-100 text-sm text-ink-600">Loading the map…</div>;

  return (
    <Map
      key={`${sighting.lat},${sighting.lon}`}
      mapStyle={style}
      initialViewState={{ longitude: sighting.lon, latitude: sighting.lat, zoom: 15 }}
      style={{ width: '100%', height: '100%' }}
      interactiveLayerIds={['review-masts']}
      onLoad={(e) => {
        const map = e.target;
        if (!map.hasImage(SIGHTING_ICON_ID)) {
          const img = mastIconImage(SIGHTING_ICON_ID, []);
          if (img) map.addImage(SIGHTING_ICON_ID, img, { pixelRatio: 2 });
        }
        // Frame the whole search circle, whatever the map's size.
        const coords = circle([sighting.lon, sighting.lat], (radiusM * 1.15) / 1000, { steps: 8, units: 'kilometers' }).geometry.coordinates[0]!;
        const lons = coords.map((c) => c[0]!);
        const lats = coords.map((c) => c[1]!);
        map.fitBounds([Math.min(...lons), Math.min(...lats), Math.max(...lons), Math.max(...lats)], { duration: 0, padding: 10 });
      }}
      onClick={(e) => {
        const id = e.features?.[0]?.properties?.id;
        if (id) onSelectMast(String(id));
      }}
    >
      <NavigationControl position="top-right" showCompass={false} />
      <ScaleControl position="bottom-left" />
      <Source id="review-ring" type="geojson" data={ring}>
        <Layer id="review-ring-fill" type="fill" paint={{ 'fill-color': '#d9891a', 'fill-opacity': 0.06 }} />
        <Layer id="review-ring-line" type="line" paint={{ 'line-color': '#b46d10', 'line-width': 1.5, 'line-dasharray': [2, 2] }} />
      </Source>
      <Source id="review-masts-src" type="geojson" data={mastPoints}>
        <Layer
          id="review-masts"
          type="circle"
          paint={{
            'circle-radius': ['case', ['get', 'selected'], 13, 10],
            'circle-color': ['case', ['get', 'selected'], '#1f3043', '#476785'],
            'circle-stroke-color': '#ffffff',
            'circle-stroke-width': 2,
          }}
        />
        <Layer
          id="review-mast-labels"
          type="symbol"
          layout={{ 'text-field': ['get', 'label'], 'text-font': [...LABEL_FONTS.bold], 'text-size': 12, 'text-allow-overlap': true }}
          paint={{ 'text-color': '#ffffff' }}
        />
      </Source>
      <Source id="review-sighting" type="geojson" data={point}>
        <Layer id="review-sighting-mark" type="symbol" layout={{ 'icon-image': SIGHTING_ICON_ID, 'icon-allow-overlap': true, 'icon-size': 1.2 }} />
      </Source>
    </Map>
  );
}
