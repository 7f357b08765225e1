import 'maplibre-gl/dist/maplibre-gl.css';
import { useEffect, useMemo, useRef, useState } from 'react';
import Map, { Layer, NavigationControl, ScaleControl, Source, type MapRef } from 'react-map-gl/maplibre';
import type { Map as MaplibreMap, StyleSpecification } from 'maplibre-gl';
import type { FeatureCollection } from 'geojson';
import { LABEL_FONTS, buildBasemapStyle } from '../map/map-style';
import { getBearingLine, type LatLon } from '../../lib/domain/geodesy';
import { regionsApi } from '../../lib/client/regions-api';
import type { ShortlistItemJson } from '../../lib/schemas/shortlist';
import { loadLabelFonts } from '../map/label-fonts';
import { GRADE_COLOURS } from './grades';

declare global {
  interface Window {
    bearlinePlannerMap?: MaplibreMap;
  }
}

interface Props {
  position: LatLon | null;
  items: ShortlistItemJson[];
  selectedCellId: string | null;
  onPickPosition: (p: LatLon) => void;
  onSelect: (cellId: string) => void;
}

/** How many candidates get a bearing line drawn. */
const LINES = 5;

export default function PlannerMap({ position, items, selectedCellId, onPickPosition, onSelect }: Props) {
  const mapRef = useRef<MapRef>(null);
  const [style, setStyle] = useState<StyleSpecification | null>(null);
  const [bounds, setBounds] = useState<[number, number, number, number] | null>(null);

  useEffect(() => {
    loadLabelFonts().then(() => setStyle(buildBasemapStyle(window.location.origin)));
    // Only the regions' extent is needed: their bboxes, with the coarsest outlines.
    regionsApi.list(0).then(
      (r) => {
        const boxes = r.items.map((g) => g.bbox);
        setBounds(
          boxes.length
            ? [
                Math.min(...boxes.map((b) => b[0])),
                Math.min(...boxes.map((b) => b[1])),
                Math.max(...boxes.map((b) => b[2])),
                Math.max(...boxes.map((b) => b[3])),
              ]
            : [-180, -60, 180, 75],
        );
      },
      () => setBounds([-180, -60, 180, 75]),
    );
  }, []);

  useEffect(() => {
    if (position) mapRef.current?.flyTo({ center: [position.lon, position.lat], zoom: Math.max(mapRef.current.getZoom(), 10.5), duration: 600 });
    // Keyed on the position's values: a new object for the same place does not move the map.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [position?.lat, position?.lon]);

  const lines = useMemo<FeatureCollection>(() => {
    if (!position) return { type: 'FeatureCollection', features: [] };
    const shown = items.slice(0, LINES);
    const selected = items.find((i) => i.cell_id === selectedCellId);
    if (selected && !shown.includes(selected)) shown.push(selected);
    return {
      type: 'FeatureCollection',
      features: shown.map((i) =>
        getBearingLine(position, i.mast, {
          properties: { cellId: i.cell_id, colour: GRADE_COLOURS[i.grade], selected: i.cell_id === selectedCellId },
        }),
      ),
    };
  }, [position, items, selectedCellId]);

  const masts = useMemo<FeatureCollection>(() => {
    const seen = new Set<string>();
    return {
      type: 'FeatureCollection',
      features: items
        .filter((i) => !seen.has(i.mast.id) && seen.add(i.mast.id))
        .map((i) => ({
          type: 'Feature',
          properties: { cellId: i.cell_id, name: i.mast.name, colour: i.operator.colour ?? '#476785' },
          geometry: { type: 'Point', coordinates: [i.mast.lon, i.mast.lat] },
        })),
    };
  }, [items]);

  const customer = useMemo<FeatureCollection>(
    () => ({
      type: 'FeatureCollection',
      features: position ? [{ type: 'Feature', properties: {}, geometry: { type: 'Point', coordinates: [position.lon, position.lat] } }] : [],
    }),
    [position],
  );

  if (!style || !bounds) return <div className="flex h-full items-center justify-center bg-ink-100 text-sm text-ink-600">Loading the map…</div>;

  return (
    <Map
      ref={mapRef}
      mapStyle={style}
      initialViewState={position ? { longitude: position.lon, latitude: position.lat, zoom: 10.5 } : { bounds, fitBoundsOptions: { padding: 30 } }}
      style={{ width: '100%', height: '100%' }}
      cursor="crosshair"
      interactiveLayerIds={['planner-masts']}
      onLoad={(e) => {
        window.bearlinePlannerMap = e.target;
      }}
      onClick={(e) => {
        const hit = e.features?.[0];
        if (hit?.properties?.cellId) onSelect(String(hit.properties.cellId));
        else onPickPosition({ lat: e.lngLat.lat, lon: e.lngLat.lng });
      }}
    >
      <NavigationControl position="top-right" />
      <ScaleControl position="bottom-left" />
      <Source id="planner-lines" type="geojson" data={lines}>
        <Layer
          id="planner-lines-casing"
          type="line"
          paint={{ 'line-color': '#ffffff', 'line-width': ['case', ['get', 'selected'], 7, 4] }}
          layout={{ 'line-cap': 'round' }}
        />
        <Layer
          id="planner-lines"
          type="line"
          paint={{ 'line-color': ['get', 'colour'], 'line-width': ['case', ['get', 'selected'], 4, 2], 'line-dasharray': [3, 1.5] }}
          layout={{ 'line-cap': 'round' }}
        />
      </Source>
      <Source id="planner-masts-src" type="geojson" data={masts}>
        <Layer
          id="planner-masts"
          type="circle"
          paint={{ 'circle-radius': 7, 'circle-color': ['get', 'colour'], 'circle-stroke-color': '#ffffff', 'circle-stroke-width': 2 }}
        />
        <Layer
          id="planner-mast-labels"
          type="symbol"
          layout={{ 'text-field': ['get', 'name'], 'text-font': [...LABEL_FONTS.regular], 'text-size': 11, 'text-offset': [0, 1.2], 'text-anchor': 'top' }}
          paint={{ 'text-color': '#1f3043', 'text-halo-color': '#ffffff', 'text-halo-width': 1.5 }}
        />
      </Source>
      <Source id="planner-customer" type="geojson" data={customer}>
        <Layer id="planner-customer-halo" type="circle" paint={{ 'circle-radius': 11, 'circle-color': '#d9891a', 'circle-opacity': 0.25 }} />
        <Layer
          id="planner-customer-dot"
          type="circle"
          paint={{ 'circle-radius': 6, 'circle-color': '#d9891a', 'circle-stroke-color': '#1f3043', 'circle-stroke-width': 2 }}
        />
      </Source>
    </Map>
  );
}
