import 'maplibre-gl/dist/maplibre-gl.css';
import { useCallback, useEffect, useLayoutEffect, useMemo, useRef, useState } from 'react';
import Map, {
  Layer,
  NavigationControl,
  Popup,
  ScaleControl,
  Source,
  useMap,
  type MapLayerMouseEvent,
  type MapRef,
  type ViewState,
} from 'react-map-gl/maplibre';
import type { Map as MaplibreMap, StyleSpecification } from 'maplibre-gl';
import type { FeatureCollection } from 'geojson';
import { ApiError, mapApi, mastsApi, operatorsApi, regionsApi, type RegionJson, type SearchHitJson } from '../../lib/client/api';
import { sightingsApi } from '../../lib/client/sightings-api';
import { SIGHTING_STRUCTURE_LABELS, type PendingSightingCollectionJson } from '../../lib/schemas/sightings';
import { loadLabelFonts } from './label-fonts';
import {
  MAST_CLUSTER_COUNT_LAYER,
  MAST_CLUSTER_LAYER,
  MAST_CLUSTER_LAYER_ID,
  MAST_LABEL_LAYER,
  MAST_SOURCE_ID,
  MAST_SOURCE_LAYER,
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
import { MAST_ICON_PIXEL_RATIO, isMastIconId, mastIconImage, type OperatorMark } from './mast-icons';
import MapFilters from './MapFilters';
import MapLegend from './MapLegend';
import MapSearch from './MapSearch';
import MastPanel from './MastPanel';

interface Props {
  canEditMasts: boolean;
}

type InitialView = Partial<ViewState> & { bounds?: [number, number, number, number] };

declare global {
  interface Window {
    /** The map instance, for browser tests and the console. */
    bearlineMap?: MaplibreMap;
  }
}

const VIEW_KEY = 'bearline.map.view';
const WORLD_VIEW: InitialView = { longitude: 0, latitude: 20, zoom: 1.5 };

/** Tile URLs made absolute on this page's origin (MapLibre's worker cannot resolve relative ones). */
function rebaseStyle(style: StyleSpecification, origin: string): StyleSpecification {
  const rebase = (t: string) => {
    const u = new URL(t, origin);
    return origin + decodeURI(u.pathname) + u.search;
  };
  const sources = Object.fromEntries(Object.entries(style.sources).map(([id, s]) => [id, 'tiles' in s && s.tiles ? { ...s, tiles: s.tiles.map(rebase) } : s]));
  return { ...style, sources };
}

function readSavedView(): InitialView | null {
  try {
    const v = JSON.parse(localStorage.getItem(VIEW_KEY) ?? 'null');
    if (v && [v.longitude, v.latitude, v.zoom].every(Number.isFinite)) return { longitude: v.longitude, latitude: v.latitude, zoom: v.zoom };
  } catch {
    // A broken saved view is simply ignored.
  }
  return null;
}

function boundsOf(regions: readonly RegionJson[]): [number, number, number, number] | null {
  let box: [number, number, number, number] | null = null;
  for (const {
    bbox: [w, s, e, n],
  } of regions)
    box = box ? [Math.min(box[0], w), Math.min(box[1], s), Math.max(box[2], e), Math.max(box[3], n)] : [w, s, e, n];
  return box;
}

/** Region outlines are drawn simplified to a pixel at this zoom (about 15 m): finer than the map
 * shows them at a region's scale, and a few kilobytes however detailed the imported outline. */
const REGION_OUTLINE_ZOOM = 10;

/** A region asked for in the address (?region=ID), else the saved view, else all regions, else the world. */
function chooseInitialView(regions: readonly RegionJson[], regionId: string | null): InitialView {
  const asked = regionId ? boundsOf(regions.filter((r) => r.id === regionId)) : null;
  if (asked) return { bounds: asked };
  const saved = readSavedView();
  if (saved) return saved;
  const all = boundsOf(regions);
  return all ? { bounds: all } : WORLD_VIEW;
}

function regionFeatures(regions: readonly RegionJson[]): FeatureCollection {
  return {
    type: 'FeatureCollection',
    features: regions.map((r) => ({ type: 'Feature', id: Number(r.id), geometry: r.geometry, properties: { id: r.id, name: r.name } })),
  };
}

/** Supplies mast marks to MapLibre as their image ids are first needed. */
function MastImages({ operators }: { operators: readonly OperatorMark[] }) {
  const { current } = useMap();
  useEffect(() => {
    const map = current?.getMap();
    if (!map) return;
    const onMissing = (e: { id: string }) => {
      if (map.hasImage(e.id)) return;
      const image = mastIconImage(e.id, operators);
      if (image) map.addImage(e.id, image, { pixelRatio: MAST_ICON_PIXEL_RATIO });
    };
    // Colours may have changed since the marks were drawn.
    for (const id of map.listImages()) {
      if (!isMastIconId(id)) continue;
      const image = mastIconImage(id, operators);
      if (image) map.updateImage(id, image);
    }
    map.on('styleimagemissing', onMissing);
    return () => {
      map.off('styleimagemissing', onMissing);
    };
  }, [current, operators]);
  return null;
}

function sortBands(bands: Iterable<string>): string[] {
  const key = (b: string) => {
    const m = /^([A-Za-z]*)(\d+)(.*)$/.exec(b);
    return m ? `${m[1].toLowerCase() === 'n' ? '1' : m[1] ? '0' : '2'}${m[2].padStart(5, '0')}${m[3]}` : `3${b}`;
  };
  return [...bands].sort((a, b) => key(a).localeCompare(key(b)));
}

function useIsPhone(): boolean {
  const [phone, setPhone] = useState(() => typeof window !== 'undefined' && window.matchMedia('(max-width: 639px)').matches);
  useEffect(() => {
    const mq = window.matchMedia('(max-width: 639px)');
    const on = () => setPhone(mq.matches);
    mq.addEventListener('change', on);
    return () => mq.removeEventListener('change', on);
  }, []);
  return phone;
}

export default function MapView({ canEditMasts }: Props) {
  const mapRef = useRef<MapRef | null>(null);
  const setMapRef = useCallback((ref: MapRef | null) => {
    mapRef.current = ref;
    if (ref) window.bearlineMap = ref.getMap();
  }, []);
  const frameRef = useRef<HTMLDivElement>(null);
  const [top, setTop] = useState(64);
  const [style, setStyle] = useState<StyleSpecification | null>(null);
  const [operators, setOperators] = useState<OperatorMark[] | null>(null);
  const [initialView, setInitialView] = useState<InitialView | null>(null);
  const [regions, setRegions] = useState<RegionJson[]>([]);
  const [loadError, setLoadError] = useState<string | null>(null);
  const [filters, setFilters] = useState<MastFilterState>(NO_MAST_FILTER);
  const [bands, setBands] = useState<string[]>([]);
  const [selectedId, setSelectedId] = useState<string | null>(null);
  const [hovering, setHovering] = useState(false);
  const [pending, setPending] = useState<PendingSightingCollectionJson>({ type: 'FeatureCollection', features: [] });
  const [pendingPick, setPendingPick] = useState<PendingSightingCollectionJson['features'][number] | null>(null);
  const isPhone = useIsPhone();
  const [filtersOpen, setFiltersOpen] = useState(false);
  const origin = typeof window !== 'undefined' ? window.location.origin : '';

  // The map fills the window below the app header, whatever height it wraps to.
  useLayoutEffect(() => {
    const measure = () => frameRef.current && setTop(Math.max(0, frameRef.current.getBoundingClientRect().top + window.scrollY));
    measure();
    window.addEventListener('resize', measure);
    return () => window.removeEventListener('resize', measure);
  }, []);

  useEffect(() => {
    const regionList = regionsApi.list(REGION_OUTLINE_ZOOM).then(
      (r) => r.items,
      () => [] as RegionJson[],
    );
    Promise.all([loadLabelFonts(), mapApi.style<StyleSpecification>(), operatorsApi.list(), regionList]).then(
      ([, s, ops, regionItems]) => {
        setStyle(rebaseStyle(s, window.location.origin));
        setOperators(ops.items.map((o) => ({ id: String(o.id), name: o.name, colour: o.colour })));
        setRegions(regionItems);
        setInitialView(chooseInitialView(regionItems, new URLSearchParams(window.location.search).get('region')));
      },
      (e: unknown) => setLoadError(e instanceof ApiError ? e.message : 'The map could not be loaded'),
    );
  }, []);

  useEffect(() => {
    sightingsApi.pending().then(setPending, () => undefined);
  }, []);

  // A link such as /map?mast=12 opens that mast.
  useEffect(() => {
    const id = new URLSearchParams(window.location.search).get('mast');
    if (id && /^\d+$/.test(id)) setSelectedId(id);
  }, []);

  const [tileVersion, setTileVersion] = useState(0);
  const source = useMemo(() => mastSource(origin, tileVersion), [origin, tileVersion]);
  const mastFilter = useMemo(() => buildMastFilter(filters), [filters]);
  const selectedLayer = useMemo(() => selectedMastLayer(selectedId), [selectedId]);
  const regionData = useMemo(() => regionFeatures(regions), [regions]);

  const collectBands = useCallback(() => {
    const map = mapRef.current?.getMap();
    if (!map || !map.getSource(MAST_SOURCE_ID)) return;
    const seen = new Set<string>();
    for (const f of map.querySourceFeatures(MAST_SOURCE_ID, { sourceLayer: MAST_SOURCE_LAYER })) {
      for (const b of String(f.properties?.bands ?? '').split(',')) if (b.trim()) seen.add(b.trim());
    }
    setBands((prev) => {
      const next = new Set([...prev, ...seen]);
      return next.size === prev.length ? prev : sortBands(next);
    });
  }, []);

  /** Where a point must sit so that the mast panel (side panel or bottom sheet) does not cover it. */
  const panelOffset = useCallback((): [number, number] => {
    const rect = frameRef.current?.getBoundingClientRect();
    if (!rect) return [0, 0];
    if (isPhone) return [0, -Math.round(rect.height * 0.29)];
    return [-Math.round((window.innerWidth >= 1024 ? 512 : 448) / 2), 0];
  }, [isPhone]);

  const onLoad = useCallback(() => {
    const id = new URLSearchParams(window.location.search).get('mast');
    if (id && /^\d+$/.test(id)) {
      mastsApi.get(id).then(
        (m) => mapRef.current?.easeTo({ center: [m.lon, m.lat], zoom: Math.max(mapRef.current.getZoom(), 13), offset: panelOffset(), duration: 0 }),
        () => undefined,
      );
    }
  }, [panelOffset]);

  const onMoveEnd = useCallback(() => {
    const map = mapRef.current;
    if (!map) return;
    const c = map.getCenter();
    try {
      localStorage.setItem(VIEW_KEY, JSON.stringify({ longitude: c.lng, latitude: c.lat, zoom: map.getZoom() }));
    } catch {
      // Private windows may refuse storage; the view is then not remembered.
    }
  }, []);

  const onClick = useCallback(
    (e: MapLayerMouseEvent) => {
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
      if (f?.properties?.id === undefined) return;
      setSelectedId(String(f.properties.id));
      const map = mapRef.current;
      const rect = frameRef.current?.getBoundingClientRect();
      if (!map || !rect || f.geometry.type !== 'Point') return;
      const [dx, dy] = panelOffset();
      const covered = isPhone ? e.point.y > rect.height * 0.4 : e.point.x > rect.width + 2 * dx - 24;
      if (covered) map.easeTo({ center: f.geometry.coordinates as [number, number], offset: [dx, dy], duration: 400, essential: false });
    },
    [isPhone, panelOffset, pending],
  );

  const onPick = useCallback(
    (hit: SearchHitJson) => {
      const mast = hit.kind === 'mast';
      mapRef.current?.flyTo({ center: [hit.lon, hit.lat], zoom: mast ? 14 : 13, offset: mast ? panelOffset() : [0, 0], essential: false });
      if (mast) setSelectedId(hit.id);
    },
    [panelOffset],
  );

  const closePanel = useCallback(() => setSelectedId(null), []);
  const onMastChanged = useCallback(() => setTileVersion((v) => v + 1), []);

  const filterCount = filters.operators.length + filters.techs.length + filters.bands.length + (filters.statuses.length < 3 ? 1 : 0);

  return (
    <div
      ref={frameRef}
      className={[
        'relative w-full overflow-hidden bg-[#c9d9e3]',
        // Keep the zoom buttons clear of the side panel.
        selectedId ? 'sm:[&_.maplibregl-ctrl-top-right]:right-[29rem] lg:[&_.maplibregl-ctrl-top-right]:right-[33rem]' : '',
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
          interactiveLayerIds={[PENDING_SYMBOL_LAYER_ID, MAST_SYMBOL_LAYER_ID, MAST_CLUSTER_LAYER_ID]}
          cursor={hovering ? 'pointer' : 'grab'}
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
          {pendingPick && (
            <Popup
              longitude={pendingPick.geometry.coordinates[0]}
              latitude={pendingPick.geometry.coordinates[1]}
              anchor="bottom"
              offset={18}
              onClose={() => setPendingPick(null)}
              closeOnClick={false}
            >
              <div className="space-y-1 pr-4 text-sm text-ink-900" data-testid="pending-popup">
                <p className="font-semibold">Pending sighting</p>
                <p>
                  {SIGHTING_STRUCTURE_LABELS[pendingPick.properties.structure_type]} · seen {new Date(pendingPick.properties.observed_at).toLocaleDateString()}
                </p>
                <p>by {pendingPick.properties.mine ? 'you' : pendingPick.properties.author_name}</p>
                <p className="text-xs text-ink-600">Waiting for a reviewer; only reviewers and its author see it.</p>
              </div>
            </Popup>
          )}
        </Map>
      )}

      {operators && (
        <div className="pointer-events-none absolute left-3 right-14 top-3 z-20 flex max-w-sm flex-col gap-2">
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
        </div>
      )}

      {operators && !(isPhone && selectedId) && (
        <div className="pointer-events-none absolute bottom-8 left-3 z-10">
          <MapLegend operators={operators} defaultOpen={!isPhone} />
        </div>
      )}

      {selectedId && operators && <MastPanel mastId={selectedId} operators={operators} canEdit={canEditMasts} onClose={closePanel} onChanged={onMastChanged} />}
      <p className="sr-only" aria-live="polite">
        {selectedId ? '' : 'Select a mast on the map, or search for one by name, to see its cells.'}
      </p>
    </div>
  );
}
