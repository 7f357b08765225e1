// The mast panel covers part of the map: a side panel on wider screens, a bottom sheet on phones.
// These say where a point must sit to stay in view beside it. Pure.

export interface FrameSize {
  width: number;
  height: number;
}

/** Side panel widths in px: 28rem, and 32rem from the `lg` breakpoint (1024 px). */
const PANEL_WIDTH = { sm: 448, lg: 512 } as const;
/** The bottom sheet covers at most 58 % of the map; centring 29 % higher keeps a point above it. */
const SHEET_SHIFT = 0.29;

/** The offset (px) from the map's centre at which a point is clear of the panel. */
export function panelOffset(frame: FrameSize | null, isPhone: boolean, windowWidth: number): [number, number] {
  if (!frame) return [0, 0];
  if (isPhone) return [0, -Math.round(frame.height * SHEET_SHIFT)];
  return [-Math.round((windowWidth >= 1024 ? PANEL_WIDTH.lg : PANEL_WIDTH.sm) / 2), 0];
}

/** Whether a clicked point (px within the map) would end up under the panel once it opens. */
export function isUnderPanel(point: { x: number; y: number }, frame: FrameSize, isPhone: boolean, offset: [number, number]): boolean {
  return isPhone ? point.y > frame.height * 0.4 : point.x > frame.width + 2 * offset[0] - 24;
}
