// Bearline's basemap style: a calm paper-and-slate palette over the app's own
// vector tiles. Pure data; the style endpoint and the map island share it.
import type { LayerSpecification, LineLayerSpecification, StyleSpecification, SymbolLayerSpecification } from 'maplibre-gl';

/** The basemap colours, also used by the legend. */
export const BASEMAP_PALETTE = {
  sea: '#c9d9e3',
  land: '#f5f2ea',
  coast: '#aabccb',
  wood: '#d3e2c8',
  farm: '#eeecd9',
  moor: '#e8e6d2',
  settled: '#ebe4dc',
  water: '#a7c3d6',
  river: '#86aac2',
  roadMajor: '#f3d9a8',
  roadMajorCasing: '#c79f5f',
  roadMinor: '#ffffff',
  roadMinorCasing: '#c3bcb0',
  track: '#b3a894',
  label: '#1f3043',
  labelSoft: '#476785',
  waterLabel: '#36607e',
  peakLabel: '#6b5a3e',
  halo: 'rgba(255,255,255,0.92)',
} as const;

/**
 * Font stacks for labels. The style has no `glyphs` URL, so MapLibre draws
 * every glyph in the browser from these CSS families; the first name also
 * tells it the weight ("Bold", "SemiBold") or style ("Italic").
 */
export const LABEL_FONTS = {
  regular: ['Noto Sans Regular', 'Noto Sans'],
  semibold: ['Noto Sans SemiBold', 'Noto Sans'],
  bold: ['Noto Sans Bold', 'Noto Sans'],
  italic: ['Noto Sans Italic', 'Noto Sans'],
} as const;

export const BASEMAP_SOURCE_ID = 'basemap';
export const BASEMAP_MAX_ZOOM = 14;

/** The path of a tile layer, with MapLibre's {z}/{x}/{y} placeholders. */
export function tilePathTemplate(layer: string): string {
  return `/api/tiles/${layer}/{z}/{x}/{y}.mvt`;
}

const P = BASEMAP_PALETTE;
const src = { source: BASEMAP_SOURCE_ID } as const;

const isPolygon = ['==', ['geometry-type'], 'Polygon'] as const;
const isLine = ['==', ['geometry-type'], 'LineString'] as const;
const kindOf = ['coalesce', ['get', 'kind'], ['get', 'class'], ''] as const;
const kindIn = (...kinds: string[]) => ['match', kindOf, kinds, true, false];

const MAJOR_ROADS = ['motorway', 'trunk', 'primary'];
const SECONDARY_ROADS = ['secondary', 'tertiary'];
const TRACKS = ['track', 'path', 'service', 'unpaved'];

function roadWidth(major: number, secondary: number, minor: number, track: number) {
  const byClass = (scale: number) => ['match', kindOf, MAJOR_ROADS, major * scale, SECONDARY_ROADS, secondary * scale, TRACKS, track * scale, minor * scale];
  return ['interpolate', ['exponential', 1.5], ['zoom'], 8, byClass(0.35), 12, byClass(1), 16, byClass(3.2)];
}

/** The paved roads drawn once: the casing below, the fill above, major roads in their own colour. */
function roadLine(id: string, [major, minor]: [string, string], width: unknown[], paint: LineLayerSpecification['paint'] = {}): LineLayerSpecification {
  return {
    id,
    type: 'line',
    ...src,
    'source-layer': 'roads',
    filter: ['!', kindIn(...TRACKS)] as never,
    layout: { 'line-cap': 'round', 'line-join': 'round' },
    paint: { 'line-color': ['match', kindOf, MAJOR_ROADS, major, minor] as never, 'line-width': width as never, ...paint },
  };
}

/** A settlement label: placed where it fits around the point, higher-ranked places first. */
function placeLabel(o: {
  id: string;
  minzoom?: number;
  kinds: string[];
  font: NonNullable<SymbolLayerSpecification['layout']>['text-font'];
  size: NonNullable<SymbolLayerSpecification['layout']>['text-size'];
  rank: number;
  offset: number;
  halo: number;
}): SymbolLayerSpecification {
  return {
    id: o.id,
    type: 'symbol',
    ...src,
    'source-layer': 'places',
    ...(o.minzoom === undefined ? {} : { minzoom: o.minzoom }),
    filter: kindIn(...o.kinds) as never,
    layout: {
      'text-field': ['get', 'name'],
      'text-font': o.font,
      'text-size': o.size,
      'symbol-sort-key': ['coalesce', ['get', 'rank'], o.rank] as never,
      'text-max-width': 8,
      'text-variable-anchor': ['center', 'top', 'bottom', 'left', 'right'],
      'text-radial-offset': o.offset,
    },
    paint: { 'text-color': P.label, 'text-halo-color': P.halo, 'text-halo-width': o.halo },
  };
}

export const BASEMAP_LAYERS: LayerSpecification[] = [
  { id: 'sea', type: 'background', paint: { 'background-color': P.sea } },
  {
    id: 'land',
    type: 'fill',
    ...src,
    'source-layer': 'land',
    paint: { 'fill-color': P.land, 'fill-outline-color': P.coast },
  },
  {
    id: 'landuse-wood',
    type: 'fill',
    ...src,
    'source-layer': 'landuse',
    filter: kindIn('wood', 'woods', 'forest', 'woodland', 'scrub') as never,
    paint: { 'fill-color': P.wood, 'fill-opacity': ['interpolate', ['linear'], ['zoom'], 8, 0.7, 13, 1] },
  },
  {
    id: 'landuse-farm',
    type: 'fill',
    ...src,
    'source-layer': 'landuse',
    filter: kindIn('farm', 'farmland', 'farmyard', 'orchard', 'pasture') as never,
    paint: { 'fill-color': P.farm },
  },
  {
    id: 'landuse-grass',
    type: 'fill',
    ...src,
    'source-layer': 'landuse',
    filter: kindIn('grass', 'grassland', 'meadow', 'heath', 'moor', 'park') as never,
    paint: { 'fill-color': P.moor },
  },
  {
    id: 'landuse-settled',
    type: 'fill',
    ...src,
    'source-layer': 'landuse',
    filter: kindIn('residential', 'town', 'village', 'settlement', 'industrial', 'commercial', 'built') as never,
    paint: { 'fill-color': P.settled },
  },
  {
    id: 'water-area',
    type: 'fill',
    ...src,
    'source-layer': 'water',
    filter: isPolygon as never,
    paint: { 'fill-color': P.water },
  },
  {
    id: 'water-line',
    type: 'line',
    ...src,
    'source-layer': 'water',
    filter: isLine as never,
    layout: { 'line-cap': 'round', 'line-join': 'round' },
    paint: {
      'line-color': P.river,
      'line-width': ['interpolate', ['exponential', 1.4], ['zoom'], 8, 0.6, 12, 1.6, 16, 5],
    },
  },
  {
    id: 'road-track',
    type: 'line',
    ...src,
    'source-layer': 'roads',
    minzoom: 11,
    filter: kindIn(...TRACKS) as never,
    layout: { 'line-cap': 'round' },
    paint: { 'line-color': P.track, 'line-width': 1, 'line-dasharray': [3, 2] },
  },
  roadLine('road-casing', [P.roadMajorCasing, P.roadMinorCasing], roadWidth(5, 3.6, 2.6, 1), { 'line-gap-width': 0 }),
  roadLine('road-fill', [P.roadMajor, P.roadMinor], roadWidth(3.4, 2.2, 1.4, 0.6)),
  {
    id: 'label-water-line',
    type: 'symbol',
    ...src,
    'source-layer': 'water',
    minzoom: 11,
    filter: ['all', isLine, ['has', 'name']] as never,
    layout: {
      'text-field': ['get', 'name'],
      'text-font': [...LABEL_FONTS.italic],
      'text-size': 11.5,
      'symbol-placement': 'line',
      'text-letter-spacing': 0.05,
    },
    paint: { 'text-color': P.waterLabel, 'text-halo-color': P.halo, 'text-halo-width': 1.2 },
  },
  {
    id: 'label-water-area',
    type: 'symbol',
    ...src,
    'source-layer': 'water',
    minzoom: 10,
    filter: ['all', isPolygon, ['has', 'name']] as never,
    layout: {
      'text-field': ['get', 'name'],
      'text-font': [...LABEL_FONTS.italic],
      'text-size': 12,
      'text-letter-spacing': 0.05,
      'text-max-width': 7,
    },
    paint: { 'text-color': P.waterLabel, 'text-halo-color': P.halo, 'text-halo-width': 1.2 },
  },
  {
    id: 'label-road',
    type: 'symbol',
    ...src,
    'source-layer': 'roads',
    minzoom: 12,
    filter: ['has', 'name'],
    layout: {
      'text-field': ['get', 'name'],
      'text-font': [...LABEL_FONTS.regular],
      'text-size': 11,
      'symbol-placement': 'line',
    },
    paint: { 'text-color': P.labelSoft, 'text-halo-color': P.halo, 'text-halo-width': 1.4 },
  },
  {
    id: 'label-peak',
    type: 'symbol',
    ...src,
    'source-layer': 'places',
    minzoom: 10.5,
    filter: kindIn('peak', 'hill') as never,
    layout: {
      'text-field': [
        'format',
        ['get', 'name'],
        {},
        ['case', ['has', 'ele_m'], ['concat', '\n', ['to-string', ['round', ['to-number', ['get', 'ele_m']]]], ' m'], ''],
        { 'font-scale': 0.85 },
      ],
      'text-font': [...LABEL_FONTS.italic],
      'text-size': 11,
      'text-max-width': 8,
    },
    paint: { 'text-color': P.peakLabel, 'text-halo-color': P.halo, 'text-halo-width': 1.3 },
  },
  placeLabel({
    id: 'label-place-minor',
    minzoom: 9.5,
    kinds: ['village', 'hamlet', 'locality'],
    font: ['match', kindOf, 'village', ['literal', [...LABEL_FONTS.semibold]], ['literal', [...LABEL_FONTS.regular]]] as never,
    size: ['interpolate', ['linear'], ['zoom'], 10, ['match', kindOf, 'village', 12, 10.5], 15, ['match', kindOf, 'village', 16, 13]] as never,
    rank: 5,
    offset: 0.9,
    halo: 1.5,
  }),
  placeLabel({
    id: 'label-place-major',
    kinds: ['city', 'town'],
    font: [...LABEL_FONTS.bold],
    size: ['interpolate', ['linear'], ['zoom'], 8, 12, 12, 16, 15, 19],
    rank: 1,
    offset: 1,
    halo: 1.8,
  }),
  {
    id: 'label-island',
    type: 'symbol',
    ...src,
    'source-layer': 'places',
    maxzoom: 10.5,
    filter: kindIn('island', 'archipelago') as never,
    layout: {
      'text-field': ['get', 'name'],
      'text-font': [...LABEL_FONTS.italic],
      'text-size': ['interpolate', ['linear'], ['zoom'], 5, 12, 10, 20],
      'text-letter-spacing': 0.25,
      'text-transform': 'uppercase',
      'text-allow-overlap': false,
    },
    paint: {
      'text-color': P.labelSoft,
      'text-opacity': ['interpolate', ['linear'], ['zoom'], 9.5, 0.9, 10.5, 0],
      'text-halo-color': P.halo,
      'text-halo-width': 1.2,
    },
  },
];

/**
 * The basemap style for a given origin. Tile URLs are absolute because
 * MapLibre fetches tiles in a worker, where relative URLs do not resolve.
 */
export function buildBasemapStyle(origin: string): StyleSpecification {
  return {
    version: 8,
    name: 'Bearline basemap',
    sources: {
      [BASEMAP_SOURCE_ID]: {
        type: 'vector',
        tiles: [origin + tilePathTemplate('basemap')],
        minzoom: 0,
        maxzoom: BASEMAP_MAX_ZOOM,
        attribution: 'Bearline demo data (invented)',
      },
    },
    layers: BASEMAP_LAYERS,
  };
}
