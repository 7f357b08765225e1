import type { GradeJson, ShortlistItemJson, TerrainStatusJson } from '../../lib/schemas/shortlist';
import type { CalibrationConfidenceJson } from '../../lib/schemas/shortlist';
import { formatDb } from '../../lib/domain/format';

/**
 * Bearline's grade colours: a ramp from deep green to slate, readable with the text label beside it.
 * White text on each stays above 4.5:1 (WCAG 2.1 AA): 6.1, 5.2, 5.1, 5.5, 5.5.
 */
export const GRADE_COLOURS: Record<GradeJson, string> = {
  excellent: '#1f6f4a',
  good: '#3d7a2e',
  fair: '#9a6212',
  poor: '#b4442f',
  unusable: '#5d6b79',
};

export const GRADE_LABELS: Record<GradeJson, string> = {
  excellent: 'Excellent',
  good: 'Good',
  fair: 'Fair',
  poor: 'Poor',
  unusable: 'Unusable',
};

export const TERRAIN_LABELS: Record<TerrainStatusJson, string> = {
  clear: 'Clear',
  fresnel: 'Fresnel infringed',
  obstructed: 'Obstructed',
  unknown: 'Not checked',
};

export function GradeBadge({ grade, prefix }: { grade: GradeJson; prefix?: string }) {
  return (
    <span
      className="inline-flex items-center gap-1 whitespace-nowrap rounded px-1.5 py-0.5 text-xs font-semibold text-white"
      style={{ background: GRADE_COLOURS[grade] }}
    >
      {prefix && <span className="sr-only">{prefix} </span>}
      {GRADE_LABELS[grade]}
    </span>
  );
}

export const CONFIDENCE_LABELS: Record<CalibrationConfidenceJson, string> = { high: 'high', medium: 'medium', low: 'low' };

/** How far a prediction can be trusted: readings behind it and the remaining uncertainty. */
export function describeConfidence(c: ShortlistItemJson['calibration']): string {
  if (!c) return 'model only (±8 dB)';
  return `${CONFIDENCE_LABELS[c.confidence]} confidence: ${c.readings_used} reading${c.readings_used === 1 ? '' : 's'}, ±${formatDb(c.uncertainty_db)}`;
}
