// The planner's state as a shareable URL, the kit form's own checks, and which candidate stays
// selected when a new shortlist arrives. Pure: the planner island calls these.
import { ID_PATTERN } from '../schemas/params';

export interface KitForm {
  antennaId: string;
  cableId: string;
  cableM: string;
  heightM: string;
  /** Preferred operator (a bonus in the ranking). */
  operator: string;
  /** The customer's SIM operator: only its cells are listed. */
  simOperator: string;
}

export interface PlannerUrlState {
  position: { lat: number; lon: number } | null;
  kit: Partial<KitForm>;
  cellId: string | null;
}

const KIT_PARAMS: Record<keyof KitForm, string> = {
  antennaId: 'antenna',
  cableId: 'cable',
  cableM: 'cable_m',
  heightM: 'height_m',
  operator: 'operator',
  simOperator: 'sim',
};

const NUMBER = /^-?\d+(\.\d+)?$/;

/** Reads what a shared or reloaded planner link holds; anything malformed is ignored. */
export function readPlannerUrl(search: string): PlannerUrlState {
  const p = new URLSearchParams(search);
  const latText = p.get('lat') ?? '';
  const lonText = p.get('lon') ?? '';
  const lat = Number(latText);
  const lon = Number(lonText);
  const position = NUMBER.test(latText) && NUMBER.test(lonText) && Math.abs(lat) <= 90 && Math.abs(lon) <= 180 ? { lat, lon } : null;
  const kit: Partial<KitForm> = {};
  for (const [key, name] of Object.entries(KIT_PARAMS) as [keyof KitForm, string][]) {
    const v = p.get(name);
    if (v === null) continue;
    const numeric = key === 'cableM' || key === 'heightM';
    if (numeric ? NUMBER.test(v) : v === '' || ID_PATTERN.test(v)) kit[key] = v;
  }
  const cell = p.get('cell');
  return { position, kit, cellId: cell && ID_PATTERN.test(cell) ? cell : null };
}

/** The planner's state as a query string; keeps parameters it does not own (e.g. `customer`). */
export function writePlannerUrl(search: string, state: PlannerUrlState): string {
  const p = new URLSearchParams(search);
  for (const name of ['lat', 'lon', 'cell', ...Object.values(KIT_PARAMS)]) p.delete(name);
  if (state.position) {
    p.set('lat', state.position.lat.toFixed(6));
    p.set('lon', state.position.lon.toFixed(6));
  }
  for (const [key, name] of Object.entries(KIT_PARAMS) as [keyof KitForm, string][]) {
    const v = state.kit[key];
    if (v) p.set(name, v);
  }
  if (state.cellId) p.set('cell', state.cellId);
  const text = p.toString();
  return text ? `?${text}` : '';
}

export type KitErrors = Partial<Record<'height_m' | 'cable_m', string>>;

/** Required kit fields, checked before anything is predicted or saved. */
export function checkKitForm(kit: Pick<KitForm, 'heightM' | 'cableM' | 'cableId'>): KitErrors {
  const errors: KitErrors = {};
  const height = kit.heightM.trim().replace(',', '.');
  if (height === '') errors.height_m = 'Enter the mount height';
  else if (!NUMBER.test(height)) errors.height_m = 'Mount height must be a number of metres';
  else if (Number(height) < 0 || Number(height) > 100) errors.height_m = 'Mount height must be between 0 and 100 m';
  if (kit.cableId) {
    const length = kit.cableM.trim().replace(',', '.');
    if (length === '') errors.cable_m = 'Enter the cable length';
    else if (!NUMBER.test(length)) errors.cable_m = 'Cable length must be a number of metres';
    else if (Number(length) < 0 || Number(length) > 200) errors.cable_m = 'Cable length must be between 0 and 200 m';
  }
  return errors;
}

/** A number typed with a decimal point or comma. */
export function readMetres(text: string): number {
  return Number(text.trim().replace(',', '.'));
}

/**
 * The candidate to select in a new shortlist: the same cell when only the kit changed and it is
 * still listed, a cell asked for (a shared link), otherwise the new #1 — a new position always
 * starts from the top.
 */
export function chooseSelection(
  items: readonly { cell_id: string }[],
  current: string | null,
  options: { samePosition: boolean; wanted?: string | null },
): string | null {
  if (options.wanted && items.some((i) => i.cell_id === options.wanted)) return options.wanted;
  if (options.samePosition && current && items.some((i) => i.cell_id === current)) return current;
  return items[0]?.cell_id ?? null;
}
