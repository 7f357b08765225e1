import type { Grade, TerrainStatus } from '../../lib/client/planner-api';

/** Bearline's grade colours: a ramp from deep green to slate, readable with the text label beside it. */
export const GRADE_COLOURS: Record<Grade, string> = {
  excellent: '#1f6f4a',
  good: '#4c8f3a',
  fair: '#c9821b',
  poor: '#b4442f',
  unusable: '#5d6b79',
};

export const GRADE_LABELS: Record<Grade, string> = {
  excellent: 'Excellent',
  good: 'Good',
  fair: 'Fair',
  poor: 'Poor',
  unusable: 'Unusable',
};

export const TERRAIN_LABELS: Record<TerrainStatus, string> = {
  clear: 'Clear',
  fresnel: 'Fresnel infringed',
  obstructed: 'Obstructed',
  unknown: 'Not checked',
};

export function GradeBadge({ grade }: { grade: Grade }) {
  return (
    <span className="inline-flex items-center gap-1 whitespace-nowrap rounded px-1.5 py-0.5 text-xs font-semibold text-white" style={{ background: GRADE_COLOURS[grade] }}>
      {GRADE_LABELS[grade]}
    </span>
  );
}
