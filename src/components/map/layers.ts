// Layer and source specs for the mast map, with stable ids.
import type {
  CircleLayerSpecification,
  LineLayerSpecification,
  ExpressionSpecification,
  FilterSpecification,
  SymbolLayerSpecification,
  VectorSourceSpecification,
} from 'maplibre-gl';
import { LABEL_FONTS, tilePathTemplate } from './map-style';
import { MAST_ICON_EXPRESSION, SIGHTING_ICON_ID } from './mast-icons';
import { MAST_STATUSES, type MastStatus } from '../../lib/schemas/mast-enums';

export const MAST_SOURCE_ID = 'masts';
export const MAST_SOURCE_LAYER = 'masts';
export const MAST_SYMBOL_LAYER_ID = 'masts-symbol';
export const MAST_SELECTED_LAYER_ID = 'masts-selected';
export const MAST_LABEL_LAYER_ID = 'masts-label';
export const MAST_TILE_MAX_ZOOM = 14;

/** Zoom at which mast names appear. */
export const MAST_LABEL_MIN_ZOOM = 12;

/**
 * The mast tiles; a new `version` makes MapLibre fetch them afresh after an edit. The filter goes to
 * the server too, so the clusters of the low zooms count only the masts it keeps.
 */
export function mastSource(origin: string, version = 0, filter: MastFilterState = NO_MAST_FILTER): VectorSourceSpecification {
  const query = mastTileQuery(filter);
  if (version) query.set('v', String(version));
  const search = query.toString();
  return {
    type: 'vector',
    tiles: [origin + tilePathTemplate('masts') + (search ? `?${search}` : '')],
    minzoom: 0,
    maxzoom: MAST_TILE_MAX_ZOOM,
  };
}

/** The tile endpoint's filter parameters for a filter state (none when it keeps every mast). */
export function mastTileQuery(f: MastFilterState): URLSearchParams {
  const q = new URLSearchParams();
  if (f.operators.length) q.set('operator', [...f.operators].sort().join(','));
  if (f.techs.length) q.set('tech', [...f.techs].sort().join(','));
  if (f.bands.length) q.set('band', [...f.bands].sort().join(','));
  if (f.statuses.length && f.statuses.length < MAST_STATUSES.length) q.set('status', [...f.statuses].sort().join(','));
  return q;
}

const status = ['coalesce', ['get', 'status'], 'active'] as unknown as ExpressionSpecification;

/**
 * Masts as one symbol each. Overlapping marks are not drawn (`icon-overlap:
 * never`), so dense areas thin out when zoomed out; active masts with more
 * operators win the placement.
 */
export const MAST_SYMBOL_LAYER: Omit<SymbolLayerSpecification, 'source'> = {
  id: MAST_SYMBOL_LAYER_ID,
  type: 'symbol',
  'source-layer': MAST_SOURCE_LAYER,
  layout: {
    'icon-image': MAST_ICON_EXPRESSION as unknown as ExpressionSpecification,
    'icon-size': ['interpolate', ['linear'], ['zoom'], 7, 0.55, 10, 0.85, 12, 1, 15, 1.15],
    'icon-overlap': 'never',
    'icon-padding': 0,
    'symbol-sort-key': ['-', ['match', status, 'active', 0, 'planned', 20, 40], ['to-number', ['get', 'op_count'], 0]],
  },
};

/** Mast names, zoomed in; placed after the marks so they step aside for them. */
export const MAST_LABEL_LAYER: Omit<SymbolLayerSpecification, 'source'> = {
  id: MAST_LABEL_LAYER_ID,
  type: 'symbol',
  'source-layer': MAST_SOURCE_LAYER,
  minzoom: MAST_LABEL_MIN_ZOOM,
  layout: {
    'text-field': ['to-string', ['get', 'name']],
    'text-font': [...LABEL_FONTS.semibold],
    'text-size': 11.5,
    'text-variable-anchor': ['top', 'right', 'left', 'bottom'],
    // Clear of the mark's collision box (half its size at this zoom, in ems of the text).
    'text-radial-offset': ['interpolate', ['linear'], ['zoom'], 12, 1.9, 15, 2.15],
    'text-justify': 'auto',
    'text-max-width': 9,
    'symbol-sort-key': ['match', status, 'active', 0, 'planned', 1, 2],
  },
  paint: {
    'text-color': ['match', status, 'decommissioned', '#6b7784', '#1f3043'],
    'text-halo-color': 'rgba(255,255,255,0.95)',
    'text-halo-width': 1.5,
  },
};

export const MAST_CLUSTER_SOURCE_LAYER = 'mast_clusters';
export const MAST_CLUSTER_LAYER_ID = 'mast-clusters';
export const MAST_CLUSTER_COUNT_LAYER_ID = 'mast-clusters-count';

/**
 * Zoomed out, the server sends masts that share a grid square as one cluster with `point_count`
 * (counting only the masts the filter keeps: see mastSource). A disc that grows with the count; a
 * click zooms in on it.
 */
export const MAST_CLUSTER_LAYER: Omit<CircleLayerSpecification, 'source'> = {
  id: MAST_CLUSTER_LAYER_ID,
  type: 'circle',
  'source-layer': MAST_CLUSTER_SOURCE_LAYER,
  paint: {
    'circle-radius': ['interpolate', ['linear'], ['to-number', ['get', 'point_count'], 2], 2, 9, 50, 14, 500, 20, 5000, 26],
    'circle-color': '#2f5d86',
    'circle-opacity': 0.85,
    'circle-stroke-color': '#ffffff',
    'circle-stroke-width': 1.5,
  },
};

export const MAST_CLUSTER_COUNT_LAYER: Omit<SymbolLayerSpecification, 'source'> = {
  id: MAST_CLUSTER_COUNT_LAYER_ID,
  type: 'symbol',
  'source-layer': MAST_CLUSTER_SOURCE_LAYER,
  layout: {
    'text-field': ['number-format', ['to-number', ['get', 'point_count'], 0], { locale: 'en-GB' }],
    'text-font': [...LABEL_FONTS.semibold],
    'text-size': 11,
    'text-allow-overlap': true,
  },
  paint: { 'text-color': '#ffffff' },
};

/** A ring under the selected mast. */
export function selectedMastLayer(id: string | null): Omit<CircleLayerSpecification, 'source'> {
  return {
    id: MAST_SELECTED_LAYER_ID,
    type: 'circle',
    'source-layer': MAST_SOURCE_LAYER,
    filter: ['==', ['to-string', ['get', 'id']], id ?? ''],
    paint: {
      'circle-radius': ['interpolate', ['linear'], ['zoom'], 7, 12, 10, 18, 12, 21, 15, 24],
      'circle-color': 'rgba(217,137,26,0.18)',
      'circle-stroke-color': '#d9891a',
      'circle-stroke-width': 2.5,
    },
  };
}

export interface MastFilterState {
  operators: string[];
  techs: string[];
  bands: string[];
  statuses: MastStatus[];
}

export const NO_MAST_FILTER: MastFilterState = { operators: [], techs: [], bands: [], statuses: [...MAST_STATUSES] };

/** True when a comma-separated list attribute ("B20,B3") contains any of the values. */
function listHasAny(attribute: string, values: readonly string[]): ExpressionSpecification {
  const padded = ['concat', ',', ['coalesce', ['to-string', ['get', attribute]], ''], ','];
  return ['any', ...values.map((v) => ['in', `,${v},`, padded])] as unknown as ExpressionSpecification;
}

/** The layer filter for the chosen operators, technologies, bands and statuses. Empty lists mean "any". */
export function buildMastFilter(f: MastFilterState): FilterSpecification {
  const parts: unknown[] = [];
  if (f.operators.length) parts.push(listHasAny('op_ids', f.operators));
  if (f.techs.length) parts.push(listHasAny('techs', f.techs));
  if (f.bands.length) parts.push(listHasAny('bands', f.bands));
  if (f.statuses.length < MAST_STATUSES.length) parts.push(['in', status, ['literal', f.statuses]]);
  return (parts.length ? ['all', ...parts] : ['all']) as unknown as FilterSpecification;
}

export function isFiltering(f: MastFilterState): boolean {
  return f.operators.length + f.techs.length + f.bands.length > 0 || f.statuses.length < MAST_STATUSES.length;
}

export const REGION_SOURCE_ID = 'regions';
export const REGION_LINE_LAYER_ID = 'regions-outline';
export const REGION_LABEL_LAYER_ID = 'regions-label';

/** The team's regions as a quiet dashed outline under the masts. */
export const REGION_LINE_LAYER: Omit<LineLayerSpecification, 'source'> = {
  id: REGION_LINE_LAYER_ID,
  type: 'line',
  layout: { 'line-join': 'round' },
  paint: {
    'line-color': '#6785a3',
    'line-width': ['interpolate', ['linear'], ['zoom'], 8, 0.8, 13, 1.6],
    'line-dasharray': [5, 3],
    'line-opacity': 0.55,
  },
};

/** Region names, large and quiet, at the middle of each region. */
export const REGION_LABEL_LAYER: Omit<SymbolLayerSpecification, 'source'> = {
  id: REGION_LABEL_LAYER_ID,
  type: 'symbol',
  minzoom: 8,
  maxzoom: 12,
  layout: {
    'text-field': ['get', 'name'],
    'text-font': [...LABEL_FONTS.semibold],
    'text-size': ['interpolate', ['linear'], ['zoom'], 8, 11, 11, 15],
    'text-letter-spacing': 0.18,
    'text-transform': 'uppercase',
    'text-max-width': 8,
  },
  paint: {
    'text-color': '#6785a3',
    'text-opacity': ['interpolate', ['linear'], ['zoom'], 8, 0.75, 11, 0.75, 12, 0],
    'text-halo-color': 'rgba(255,255,255,0.7)',
    'text-halo-width': 1.2,
  },
};

export const PENDING_SOURCE_ID = 'pending-sightings';
export const PENDING_SYMBOL_LAYER_ID = 'pending-sightings-symbol';

/**
 * Pending sightings in the mark reserved for them, always drawn (never hidden behind masts): the
 * server sends only those the viewer may see (reviewers and admins all, others their own).
 */
export const PENDING_SYMBOL_LAYER: Omit<SymbolLayerSpecification, 'source'> = {
  id: PENDING_SYMBOL_LAYER_ID,
  type: 'symbol',
  layout: {
    'icon-image': SIGHTING_ICON_ID,
    'icon-size': ['interpolate', ['linear'], ['zoom'], 7, 0.6, 10, 0.9, 14, 1.1],
    'icon-allow-overlap': true,
    'icon-ignore-placement': true,
  },
};
