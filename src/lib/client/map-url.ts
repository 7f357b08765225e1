// The mast map's state as a shareable URL: the selected mast and the view (`/map?mast=12&lat=…&lon=…&zoom=…`).
// Pure: the map island calls these on selection, on every finished move and on Back.
import { ID_PATTERN } from '../schemas/params';
import type { CameraView } from './map-view-state';

export interface MapUrlState {
  mastId: string | null;
  view: CameraView | null;
}

const NUMBER = /^-?\d+(\.\d+)?$/;
/** MapLibre's zoom range (0–24); the map itself stops at 18. */
const MAX_ZOOM = 24;

/** Reads what a shared or reloaded map link holds; anything malformed is ignored. */
export function readMapUrl(search: string): MapUrlState {
  const p = new URLSearchParams(search);
  const mast = p.get('mast');
  const [latText, lonText, zoomText] = ['lat', 'lon', 'zoom'].map((k) => p.get(k) ?? '');
  const [lat, lon, zoom] = [latText, lonText, zoomText].map(Number);
  const valid = [latText, lonText, zoomText].every((t) => NUMBER.test(t)) && Math.abs(lat) <= 90 && Math.abs(lon) <= 180 && zoom >= 0 && zoom <= MAX_ZOOM;
  return { mastId: mast && ID_PATTERN.test(mast) ? mast : null, view: valid ? { latitude: lat, longitude: lon, zoom } : null };
}

/** The map's state as a query string; keeps parameters it does not own (e.g. `region`). About
 * 1 m of position (5 decimals) and a hundredth of a zoom level are plenty for a shared view. */
export function writeMapUrl(search: string, state: MapUrlState): string {
  const p = new URLSearchParams(search);
  for (const name of ['mast', 'lat', 'lon', 'zoom']) p.delete(name);
  if (state.mastId) p.set('mast', state.mastId);
  if (state.view) {
    p.set('lat', state.view.latitude.toFixed(5));
    p.set('lon', state.view.longitude.toFixed(5));
    p.set('zoom', state.view.zoom.toFixed(2));
  }
  const text = p.toString();
  return text ? `?${text}` : '';
}
