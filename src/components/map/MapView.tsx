import 'maplibre-gl/dist/maplibre-gl.css';
import { useCallback, useEffect, useMemo, useRef, useState } from 'react';
import Map, { Layer, Marker, NavigationControl, ScaleControl, Source, type MapLayerMouseEvent, type MapRef, type MarkerDragEvent } from 'react-map-gl/maplibre';
import type { Map as MaplibreMap } from 'maplibre-gl';
import { mastsApi } from '../../lib/client/masts-api';
import type { SearchHitJson } from '../../lib/schemas/mast-responses';
import { sightingsApi } from '../../lib/client/sightings-api';
import { readMapUrl } from '../../lib/client/map-url';
import { saveView } from '../../lib/client/map-view-state';
import type { PendingSightingCollectionJson } from '../../lib/schemas/sightings';
import {
  MAST_CLUSTER_COUNT_LAYER,
  MAST_CLUSTER_LAYER,
  MAST_CLUSTER_LAYER_ID,
  MAST_LABEL_LAYER,
  MAST_SOURCE_ID,
  MAST_SYMBOL_LAYER,
  MAST_SYMBOL_LAYER_ID,
  NO_MAST_FILTER,
  REGION_LABEL_LAYER,
  REGION_LINE_LAYER,
  REGION_SOURCE_ID,
  buildMastFilter,
  isFiltering,
  mastSource,
  PENDING_SOURCE_ID,
  PENDING_SYMBOL_LAYER,
  PENDING_SYMBOL_LAYER_ID,
  selectedMastLayer,
  type MastFilterState,
} from './layers';
import { regionFeatures, sortBands } from './map-data';
import { isUnderPanel, panelOffset as panelOffsetFor } from './panel-offset';
import { useFrameTop } from './use-frame-top';
import { useIsPhone } from './use-is-phone';
import { useMapSetup } from './use-map-setup';
import { useMastSelection } from './use-mast-selection';
import { useSeenBands } from './use-seen-bands';
import AddMastControl from './AddMastControl';
import MapFilters from './MapFilters';
import MapLegend from './MapLegend';
import MapSearch from './MapSearch';
import MastCreateForm, { type LatLon } from './MastCreateForm';
import MastImages from './MastImages';
import MastPanel from './MastPanel';
import PendingPopup, { type PendingSightingFeature } from './PendingPopup';
import SignalLayer from './SignalLayer';
import SignalHexPopup, { type SignalHexPick } from './SignalHexPopup';
import SignalPanel from './SignalPanel';
import { SIGNAL_FILL_LAYER_ID, hexFiguresOf } from './signal-layers';
import { useSignalUrl } from './use-signal-url';
import { withKnownOperator } from './signal-url';

interface Props {
  canEditMasts: boolean;
}

declare global {
  interface Window {
    /** The map instance, for browser tests and the console. */
    bearlineMap?: MaplibreMap;
  }
}

export default function MapView({ canEditMasts }: Props) {
  const mapRef = useRef<MapRef | null>(null);
  const setMapRef = useCallback((ref: MapRef | null) => {
    mapRef.current = ref;
    if (ref) window.bearlineMap = ref.getMap();
  }, []);
  const frameRef = useRef<HTMLDivElement>(null);
  const top = useFrameTop(frameRef);
  const { style, operators, regions, initialView, loadError } = useMapSetup();
  const { bands, collect: collectBands } = useSeenBands(mapRef);
  const [filters, setFilters] = useState<MastFilterState>(NO_MAST_FILTER);
  const { selectedId, select, recordView } = useMastSelection(mapRef);
  const [hovering, setHovering] = useState(false);
  const [pending, setPending] = useState<PendingSightingCollectionJson>({ type: 'FeatureCollection', features: [] });
  const [pendingPick, setPendingPick] = useState<PendingSightingFeature | null>(null);
  const isPhone = useIsPhone();
  const [filtersOpen, setFiltersOpen] = useState(false);
  const [linkedSignal, setSignal] = useSignalUrl();
  // A link may name an operator that is not on the map (removed since, mistyped): show all operators then.
  const signal = useMemo(() => withKnownOperator(linkedSignal, operators), [linkedSignal, operators]);
  const [hexPick, setHexPick] = useState<SignalHexPick | null>(null);
  // Adding a mast: first a click on the map (placing), then the form at that position.
  const [placing, setPlacing] = useState(false);
  const [newMastAt, setNewMastAt] = useState<LatLon | null>(null);
  const origin = typeof window !== 'undefined' ? window.location.origin : '';

  useEffect(() => {
    sightingsApi.pending().then(setPending, () => undefined);
  }, []);

  const [tileVersion, setTileVersion] = useState(0);
  const source = useMemo(() => mastSource(origin, tileVersion, filters), [origin, tileVersion, filters]);
  const mastFilter = useMemo(() => buildMastFilter(filters), [filters]);
  const selectedLayer = useMemo(() => selectedMastLayer(selectedId), [selectedId]);
  const regionData = useMemo(() => regionFeatures(regions), [regions]);

  /** Where a point must sit so that the mast panel (side panel or bottom sheet) does not cover it. */
  const panelOffset = useCallback((): [number, number] => {
    const rect = frameRef.current?.getBoundingClientRect();
    return panelOffsetFor(rect ?? null, isPhone, window.innerWidth);
  }, [isPhone]);

  // A link such as /map?mast=12 (without a view) centres that mast beside its panel.
  const onLoad = useCallback(() => {
    const linked = readMapUrl(window.location.search);
    recordView();
    if (linked.mastId && !linked.view) {
      mastsApi.get(linked.mastId).then(
        (m) => mapRef.current?.easeTo({ center: [m.lon, m.lat], zoom: Math.max(mapRef.current.getZoom(), 13), offset: panelOffset(), duration: 0 }),
        () => undefined,
      );
    }
  }, [panelOffset, recordView]);

  const onMoveEnd = useCallback(() => {
    const map = mapRef.current;
    if (!map) return;
    const c = map.getCenter();
    saveView({ longitude: c.lng, latitude: c.lat, zoom: map.getZoom() });
    recordView();
  }, [recordView]);

  const onClick = useCallback(
    (e: MapLayerMouseEvent) => {
      if (placing || newMastAt) {
        setPlacing(false);
        setNewMastAt({ lat: e.lngLat.lat, lon: e.lngLat.lng });
        const rect = frameRef.current?.getBoundingClientRect();
        const offset = panelOffset();
        if (rect && isUnderPanel(e.point, rect, isPhone, offset))
          mapRef.current?.easeTo({ center: [e.lngLat.lng, e.lngLat.lat], offset, duration: 400, essential: false });
        return;
      }
      const cluster = e.features?.find((x) => x.layer.id === MAST_CLUSTER_LAYER_ID);
      if (cluster && cluster.geometry.type === 'Point') {
        const map = mapRef.current;
        map?.easeTo({ center: cluster.geometry.coordinates as [number, number], zoom: Math.min(map.getZoom() + 2, 14), duration: 400, essential: false });
        return;
      }
      const sighting = e.features?.find((x) => x.layer.id === PENDING_SYMBOL_LAYER_ID);
      if (sighting) {
        setPendingPick(pending.features.find((p) => p.properties.id === String(sighting.properties?.id)) ?? null);
        return;
      }
      setPendingPick(null);
      const f = e.features?.find((x) => x.layer.id === MAST_SYMBOL_LAYER_ID);
      if (f?.properties?.id === undefined) {
        const hex = e.features?.find((x) => x.layer.id === SIGNAL_FILL_LAYER_ID);
        setHexPick(hex ? { lon: e.lngLat.lng, lat: e.lngLat.lat, figures: hexFiguresOf(hex.properties) } : null);
        return;
      }
      setHexPick(null);
      select(String(f.properties.id));
      const map = mapRef.current;
      const rect = frameRef.current?.getBoundingClientRect();
      if (!map || !rect || f.geometry.type !== 'Point') return;
      const offset = panelOffset();
      if (isUnderPanel(e.point, rect, isPhone, offset))
        map.easeTo({ center: f.geometry.coordinates as [number, number], offset, duration: 400, essential: false });
    },
    [isPhone, panelOffset, pending, select, placing, newMastAt],
  );

  const onPick = useCallback(
    (hit: SearchHitJson) => {
      const mast = hit.kind === 'mast';
      mapRef.current?.flyTo({ center: [hit.lon, hit.lat], zoom: mast ? 14 : 13, offset: mast ? panelOffset() : [0, 0], essential: false });
      if (mast) {
        setPlacing(false);
        setNewMastAt(null);
        select(hit.id);
      }
    },
    [panelOffset, select],
  );

  const closePanel = useCallback(() => select(null), [select]);

  // Other choices on the signal layer draw other hexagons: the figures shown no longer apply.
  useEffect(() => setHexPick(null), [signal]);
  /** The hexagon at the centre of what the panel leaves in view: the keyboard's way to a hexagon's figures. */
  const pickHexAtCentre = useCallback(() => {
    const map = mapRef.current;
    const rect = frameRef.current?.getBoundingClientRect();
    if (!map || !rect) return;
    const [dx, dy] = panelOffset();
    const point: [number, number] = [rect.width / 2 + dx, rect.height / 2 + dy];
    const at = map.unproject(point);
    const hex = map.getLayer(SIGNAL_FILL_LAYER_ID) ? map.queryRenderedFeatures(point, { layers: [SIGNAL_FILL_LAYER_ID] })[0] : undefined;
    setHexPick({ lon: at.lng, lat: at.lat, figures: hex ? hexFiguresOf(hex.properties) : null });
  }, [panelOffset]);

  const startAdding = useCallback(() => {
    select(null);
    setPendingPick(null);
    setPlacing(true);
  }, [select]);
  // The centre of what the panel leaves in view, not of the whole map.
  const placeAtCentre = useCallback(() => {
    const map = mapRef.current;
    const rect = frameRef.current?.getBoundingClientRect();
    setPlacing(false);
    if (!map || !rect) return;
    const [dx, dy] = panelOffset();
    const c = map.unproject([rect.width / 2 + dx, rect.height / 2 + dy]);
    setNewMastAt({ lat: c.lat, lon: c.lng });
  }, [panelOffset]);
  const cancelAdding = useCallback(() => {
    setPlacing(false);
    setNewMastAt(null);
  }, []);
  const onMastCreated = useCallback(
    (mast: { id: string }) => {
      setNewMastAt(null);
      setTileVersion((v) => v + 1);
      select(mast.id);
    },
    [select],
  );

  useEffect(() => {
    if (!placing) return;
    const onKey = (e: KeyboardEvent) => e.key === 'Escape' && setPlacing(false);
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  }, [placing]);
  const panelOpen = !!selectedId || !!newMastAt;
  const onMastChanged = useCallback(() => setTileVersion((v) => v + 1), []);

  const filterCount = filters.operators.length + filters.techs.length + filters.bands.length + (filters.statuses.length < 3 ? 1 : 0);

  return (
    <div
      ref={frameRef}
      className={[
        'relative w-full overflow-hidden bg-[#c9d9e3]',
        // Keep the zoom buttons clear of the side panel.
        panelOpen ? 'sm:[&_.maplibregl-ctrl-top-right]:right-[29rem] lg:[&_.maplibregl-ctrl-top-right]:right-[33rem]' : '',
      ].join(' ')}
      style={{ height: `calc(100dvh - ${top}px)`, minHeight: 360 }}
      data-testid="map-frame"
    >
      {loadError && (
        <div role="alert" className="absolute inset-x-4 top-4 z-40 rounded-md border border-alarm-100 bg-alarm-50 p-3 text-sm text-alarm-700">
          {loadError}
        </div>
      )}
      {!style && !loadError && <p className="absolute inset-0 flex items-center justify-center text-ink-600">Loading the map…</p>}
      {style && operators && initialView && (
        <Map
          ref={setMapRef}
          initialViewState={{ ...initialView, fitBoundsOptions: { padding: isPhone ? 24 : { top: 70, bottom: 30, left: 270, right: 60 } } }}
          mapStyle={style}
          interactiveLayerIds={[PENDING_SYMBOL_LAYER_ID, MAST_SYMBOL_LAYER_ID, MAST_CLUSTER_LAYER_ID, SIGNAL_FILL_LAYER_ID]}
          cursor={placing ? 'crosshair' : hovering ? 'pointer' : 'grab'}
          onMouseEnter={() => setHovering(true)}
          onMouseLeave={() => setHovering(false)}
          onClick={onClick}
          onLoad={onLoad}
          onMoveEnd={onMoveEnd}
          onIdle={collectBands}
          maxZoom={18}
          attributionControl={{ compact: true }}
          dragRotate={false}
          touchPitch={false}
          style={{ position: 'absolute', inset: 0 }}
        >
          <NavigationControl position="top-right" showCompass={false} />
          <ScaleControl position="bottom-right" unit="metric" />
          <MastImages operators={operators} />
          <SignalLayer origin={origin} state={signal} />
          <Source id={REGION_SOURCE_ID} type="geojson" data={regionData}>
            <Layer {...REGION_LINE_LAYER} />
            <Layer {...REGION_LABEL_LAYER} />
          </Source>
          <Source id={MAST_SOURCE_ID} {...source}>
            <Layer {...selectedLayer} />
            <Layer {...MAST_LABEL_LAYER} filter={mastFilter} />
            <Layer {...MAST_SYMBOL_LAYER} filter={mastFilter} />
            <Layer {...MAST_CLUSTER_LAYER} />
            <Layer {...MAST_CLUSTER_COUNT_LAYER} />
          </Source>
          <Source id={PENDING_SOURCE_ID} type="geojson" data={pending}>
            <Layer {...PENDING_SYMBOL_LAYER} />
          </Source>
          {pendingPick && <PendingPopup sighting={pendingPick} onClose={() => setPendingPick(null)} />}
          {hexPick && signal.on && <SignalHexPopup pick={hexPick} onClose={() => setHexPick(null)} />}
          {newMastAt && (
            <Marker
              longitude={newMastAt.lon}
              latitude={newMastAt.lat}
              anchor="bottom"
              draggable
              onDragEnd={(e: MarkerDragEvent) => setNewMastAt({ lat: e.lngLat.lat, lon: e.lngLat.lng })}
            >
              <svg aria-hidden="true" width="28" height="36" viewBox="0 0 28 36" data-testid="new-mast-marker">
                <path d="M14 35C14 35 26 21 26 13A12 12 0 0 0 2 13C2 21 14 35 14 35Z" fill="#a13424" stroke="white" strokeWidth="2" />
                <circle cx="14" cy="13" r="4.5" fill="white" />
              </svg>
            </Marker>
          )}
        </Map>
      )}

      {operators && (
        // One column down the left edge: the search, filters and signal choices at the top, the legend at
        // the bottom; the legend gives way (its entries scroll) so that the two never overlap.
        <div className="pointer-events-none absolute bottom-8 left-3 right-14 top-3 z-20 flex max-w-sm flex-col gap-2">
          <div className="pointer-events-auto flex gap-2">
            <MapSearch onPick={onPick} />
            <button
              type="button"
              className={`btn shrink-0 px-3 shadow-md ${filtersOpen || isFiltering(filters) ? 'bg-ink-700 text-white hover:bg-ink-800' : 'border border-ink-300 bg-white text-ink-800 hover:bg-ink-100'}`}
              aria-expanded={filtersOpen}
              aria-controls="map-filters-card"
              onClick={() => setFiltersOpen(!filtersOpen)}
              data-testid="filters-toggle"
            >
              Filters{filterCount > 0 && <span className="rounded-full bg-ember-500 px-1.5 text-xs text-white">{filterCount}</span>}
            </button>
          </div>
          <div
            id="map-filters-card"
            hidden={!filtersOpen}
            className="pointer-events-auto max-h-[60vh] overflow-y-auto rounded-lg border border-ink-200 bg-white/95 p-3 shadow-md"
          >
            <MapFilters operators={operators} bands={sortBands(new Set([...bands, ...filters.bands]))} value={filters} onChange={setFilters} />
          </div>
          {canEditMasts && !newMastAt && (
            <div className="pointer-events-auto flex flex-col">
              <AddMastControl placing={placing} onStart={startAdding} onUseCentre={placeAtCentre} onCancel={cancelAdding} />
            </div>
          )}
          <SignalPanel operators={operators} bands={bands} value={signal} onChange={setSignal} compact={isPhone} onShowCentre={pickHexAtCentre} />
          {!(isPhone && panelOpen) && (
            <div className="flex min-h-0 flex-1 flex-col items-start justify-end">
              <MapLegend operators={operators} defaultOpen={!isPhone} />
            </div>
          )}
        </div>
      )}

      {newMastAt && <MastCreateForm position={newMastAt} onPositionChange={setNewMastAt} onCreated={onMastCreated} onCancel={cancelAdding} />}
      {selectedId && !newMastAt && operators && (
        <MastPanel mastId={selectedId} operators={operators} canEdit={canEditMasts} onClose={closePanel} onChanged={onMastChanged} />
      )}
      <p className="sr-only" aria-live="polite">
        {selectedId ? '' : 'Select a mast on the map, or search for one by name, to see its cells.'}
      </p>
    </div>
  );
}
