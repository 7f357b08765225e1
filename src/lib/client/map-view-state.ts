// Where the map opens: a region asked for in the address, else the view saved on this device,
// else all regions, else the world. Pure except for the two storage helpers at the end.

export interface CameraView {
  longitude: number;
  latitude: number;
  zoom: number;
}

export type Bounds = [number, number, number, number];

/** What the map is first shown at: a camera position or a box to fit. */
export type InitialView = Partial<CameraView> & { bounds?: Bounds };

export const WORLD_VIEW: InitialView = { longitude: 0, latitude: 20, zoom: 1.5 };

const VIEW_KEY = 'bearline.map.view';

/** The smallest box holding every given box ([west, south, east, north]); null for none. */
export function boundsOf(boxes: readonly { bbox: Bounds }[]): Bounds | null {
  let box: Bounds | null = null;
  for (const {
    bbox: [w, s, e, n],
  } of boxes)
    box = box ? [Math.min(box[0], w), Math.min(box[1], s), Math.max(box[2], e), Math.max(box[3], n)] : [w, s, e, n];
  return box;
}

/** A region asked for (?region=ID), else the saved view, else all regions, else the world. */
export function chooseInitialView(regions: readonly { id: string; bbox: Bounds }[], regionId: string | null, saved: CameraView | null): InitialView {
  const asked = regionId ? boundsOf(regions.filter((r) => r.id === regionId)) : null;
  if (asked) return { bounds: asked };
  if (saved) return saved;
  const all = boundsOf(regions);
  return all ? { bounds: all } : WORLD_VIEW;
}

/** A saved view as stored text; anything malformed is ignored. */
export function parseSavedView(text: string | null): CameraView | null {
  try {
    const v = JSON.parse(text ?? 'null');
    if (v && [v.longitude, v.latitude, v.zoom].every(Number.isFinite)) return { longitude: v.longitude, latitude: v.latitude, zoom: v.zoom };
  } catch {
    // A broken saved view is simply ignored.
  }
  return null;
}

export function readSavedView(): CameraView | null {
  try {
    return parseSavedView(localStorage.getItem(VIEW_KEY));
  } catch {
    return null;
  }
}

export function saveView(view: CameraView): void {
  try {
    localStorage.setItem(VIEW_KEY, JSON.stringify(view));
  } catch {
    // Private windows may refuse storage; the view is then not remembered.
  }
}
