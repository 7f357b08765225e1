// Source and layer specs of the measured signal map (hexagon tiles from /api/tiles/signal), and
// the colour ramp of its quality grades. Pure data; SignalLayer and SignalLegend share it.
import type { ExpressionSpecification, FillLayerSpecification, FilterSpecification, LineLayerSpecification, VectorSourceSpecification } from 'maplibre-gl';
import type { SignalGrade } from '../../lib/domain/measurements';
import { SIGNAL_METRICS, SIGNAL_METRIC_UNITS, SIGNAL_MIN_READINGS, getSignalClasses, type SignalMetric } from '../../lib/domain/signal-map';
import { tilePathTemplate } from './map-style';

/**
 * Bearline's signal ramp, best to worst: deep blue, light blue, sand, orange, rust. Every pair of
 * grades stays apart (CIE76 ΔE ≥ 20) under simulated protanopia, deuteranopia and tritanopia
 * (tests/client/signal-layers.test.ts), and the ends are dark, so the grade does not rest on hue.
 */
export const SIGNAL_GRADE_COLOURS: Record<SignalGrade, string> = {
  excellent: '#1b4e8c',
  good: '#4f8fc6',
  fair: '#ecd06a',
  poor: '#d4692a',
  unusable: '#7f2a1a',
};

export const SIGNAL_GRADE_LABELS: Record<SignalGrade, string> = {
  excellent: 'Excellent',
  good: 'Good',
  fair: 'Fair',
  poor: 'Poor',
  unusable: 'Unusable',
};

/** Fill opacity of hexagons with enough readings, and of those with fewer than SIGNAL_MIN_READINGS. */
export const SIGNAL_FILL_OPACITY = 0.72;
export const SIGNAL_FAINT_OPACITY = 0.22;

export const SIGNAL_SOURCE_ID = 'signal';
export const SIGNAL_SOURCE_LAYER = 'signal';
export const SIGNAL_FILL_LAYER_ID = 'signal-fill';
export const SIGNAL_LINE_LAYER_ID = 'signal-outline';
/** The server has hexagons down to 125 m from zoom 13; closer zooms reuse those tiles. */
export const SIGNAL_TILE_MAX_ZOOM = 14;

export interface SignalState {
  on: boolean;
  metric: SignalMetric;
  /** Operator id, or '' for every operator. */
  operatorId: string;
  /** Band as stored on cells (B20, n78), or '' for every band. */
  band: string;
}

export const SIGNAL_OFF: SignalState = { on: false, metric: 'rsrp', operatorId: '', band: '' };

/** The MVT attributes of a metric: its median and how many readings it rests on. */
export function signalAttributes(metric: SignalMetric): { median: string; count: string } {
  return { median: `${metric}_median_${SIGNAL_METRIC_UNITS[metric].toLowerCase()}`, count: `${metric}_count` };
}

/** What one hexagon of the tiles holds: all its readings, and per metric how many and their median (null: none). */
export interface HexFigures {
  readings: number;
  counts: Record<SignalMetric, number>;
  medians: Record<SignalMetric, number | null>;
}

/** A hexagon's figures from its tile attributes (missing or malformed ones count as none). */
export function hexFiguresOf(properties: Record<string, unknown> | null | undefined): HexFigures {
  const num = (v: unknown) => (typeof v === 'number' ? v : typeof v === 'string' && v.trim() !== '' && Number.isFinite(Number(v)) ? Number(v) : null);
  const p = properties ?? {};
  const counts = {} as Record<SignalMetric, number>;
  const medians = {} as Record<SignalMetric, number | null>;
  for (const m of SIGNAL_METRICS) {
    const a = signalAttributes(m);
    counts[m] = num(p[a.count]) ?? 0;
    medians[m] = counts[m] > 0 ? num(p[a.median]) : null;
  }
  return { readings: num(p.readings) ?? 0, counts, medians };
}

/** The hexagon tiles for an operator and band (each '' for all). */
export function signalSource(origin: string, state: Pick<SignalState, 'operatorId' | 'band'>): VectorSourceSpecification {
  const query = new URLSearchParams();
  if (state.operatorId) query.set('operator', state.operatorId);
  if (state.band) query.set('band', state.band);
  const qs = query.toString();
  return { type: 'vector', tiles: [origin + tilePathTemplate('signal') + (qs ? `?${qs}` : '')], minzoom: 0, maxzoom: SIGNAL_TILE_MAX_ZOOM };
}

/** Colour by grade of the median: a step at each grade's lower bound (bounds belong to the better grade). */
export function signalColourExpression(metric: SignalMetric): ExpressionSpecification {
  const classes = getSignalClasses(metric); // best first
  const worst = classes[classes.length - 1]!;
  const steps: unknown[] = [];
  for (const c of [...classes].reverse()) if (c.min !== null) steps.push(c.min, SIGNAL_GRADE_COLOURS[c.grade]);
  return ['step', ['to-number', ['get', signalAttributes(metric).median]], SIGNAL_GRADE_COLOURS[worst.grade], ...steps] as unknown as ExpressionSpecification;
}

function hasMetric(metric: SignalMetric): FilterSpecification {
  return ['has', signalAttributes(metric).median] as FilterSpecification;
}

const isFaint = (metric: SignalMetric) => ['<', ['to-number', ['get', signalAttributes(metric).count], 0], SIGNAL_MIN_READINGS];

export function signalFillLayer(metric: SignalMetric): Omit<FillLayerSpecification, 'source'> {
  return {
    id: SIGNAL_FILL_LAYER_ID,
    type: 'fill',
    'source-layer': SIGNAL_SOURCE_LAYER,
    filter: hasMetric(metric),
    paint: {
      'fill-color': signalColourExpression(metric),
      'fill-opacity': ['case', isFaint(metric), SIGNAL_FAINT_OPACITY, SIGNAL_FILL_OPACITY] as unknown as ExpressionSpecification,
    },
  };
}

/** A thin light edge between hexagons, and a dashed-looking faint one around sparse hexagons. */
export function signalLineLayer(metric: SignalMetric): Omit<LineLayerSpecification, 'source'> {
  return {
    id: SIGNAL_LINE_LAYER_ID,
    type: 'line',
    'source-layer': SIGNAL_SOURCE_LAYER,
    filter: hasMetric(metric),
    paint: {
      'line-color': ['case', isFaint(metric), signalColourExpression(metric), '#ffffff'] as unknown as ExpressionSpecification,
      'line-opacity': ['case', isFaint(metric), 0.9, 0.55] as unknown as ExpressionSpecification,
      'line-width': ['interpolate', ['linear'], ['zoom'], 8, 0.4, 14, 1] as unknown as ExpressionSpecification,
    },
  };
}
