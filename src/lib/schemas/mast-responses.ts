// The JSON the mast endpoints answer, and the functions that present the values repos return in it.
import { CELL, MAST, type Cell, type CellJson, type Mast, type MastJson, type OperatorRef } from './masts';
import type { MastStatus, StructureType, Tech } from './mast-enums';
import { defineRecord, field, type JsonOf, type ValueOf } from './record';

// --- Readings (read-only here) ----------------------------------------------------------------

/** A measured sample at a place and time, optionally matched to a cell. */
export const READING = defineRecord({
  id: field.id(),
  taken_at: field.time(),
  lat: field.value<number>({ sql: 'ST_Y({t}.geom)' }),
  lon: field.value<number>({ sql: 'ST_X({t}.geom)' }),
  tech: field.value<Tech>(),
  channel: field.value<number | null>(),
  pci: field.value<number | null>(),
  rsrp_dbm: field.value<number | null>(),
  rsrq_db: field.value<number | null>(),
  sinr_db: field.value<number | null>(),
  rssi_dbm: field.value<number | null>(),
  cell_id: field.ref(),
  device: field.value<string | null>(),
  source: field.value<string | null>(),
});
export type Reading = ValueOf<typeof READING.fields>;
export type ReadingJson = JsonOf<typeof READING.fields>;

// --- Values repos return that have no record of their own --------------------------------------

/** One mast of the map list: the mast and what its cells add up to. */
export interface MastSummary {
  id: string;
  name: string;
  reference: string | null;
  status: MastStatus;
  structureType: StructureType;
  lat: number;
  lon: number;
  operators: OperatorRef[];
  /** Band labels, lowest downlink frequency first. */
  bands: string[];
  techs: Tech[];
  cellCount: number;
}

/** A mast with its cells, their operators and recent readings. */
export interface MastDetail extends Mast {
  operators: OperatorRef[];
  cells: Cell[];
  recentReadings: Reading[];
}

// --- JSON ------------------------------------------------------------------------------------

export interface OperatorRefJson {
  id: string;
  name: string;
  colour: string;
}

export interface MastFeatureProperties {
  id: string;
  name: string;
  reference: string | null;
  status: MastStatus;
  structure_type: StructureType;
  operators: OperatorRefJson[];
  /** Band labels, lowest downlink frequency first (e.g. ["B20", "B3", "n78"]). */
  bands: string[];
  techs: Tech[];
  cell_count: number;
}

export interface MastFeatureJson {
  type: 'Feature';
  /** Numeric, so that map libraries can key feature state on it. */
  id: number;
  geometry: { type: 'Point'; coordinates: [number, number] };
  properties: MastFeatureProperties;
}

export interface MastFeatureCollectionJson {
  type: 'FeatureCollection';
  features: MastFeatureJson[];
  /** True when more masts matched than `limit`; zoom in or filter. (A foreign member, RFC 7946 §6.1.) */
  truncated: boolean;
}

export interface MastDetailJson extends MastJson {
  operators: OperatorRefJson[];
  cells: CellJson[];
  recent_readings: ReadingJson[];
}

export interface SearchHitJson {
  kind: 'mast' | 'place';
  id: string;
  name: string;
  /** Mast reference, or the place's kind (town, village, hamlet, peak, island). */
  detail: string | null;
  lat: number;
  lon: number;
}

// --- Presentation ----------------------------------------------------------------------------

export const mastJson = (m: Mast): MastJson => MAST.toJson(m);
export const cellJson = (c: Cell): CellJson => CELL.toJson(c);
export const readingJson = (r: Reading): ReadingJson => READING.toJson(r);

const operatorRefJson = (o: OperatorRef): OperatorRefJson => ({ id: o.id, name: o.name, colour: o.colour });

export function mastDetailJson(m: MastDetail): MastDetailJson {
  return {
    ...mastJson(m),
    operators: m.operators.map(operatorRefJson),
    cells: m.cells.map(cellJson),
    recent_readings: m.recentReadings.map(readingJson),
  };
}

export function mastFeatureJson(m: MastSummary): MastFeatureJson {
  return {
    type: 'Feature',
    id: Number(m.id),
    geometry: { type: 'Point', coordinates: [m.lon, m.lat] },
    properties: {
      id: m.id,
      name: m.name,
      reference: m.reference,
      status: m.status,
      structure_type: m.structureType,
      operators: m.operators.map(operatorRefJson),
      bands: m.bands,
      techs: m.techs,
      cell_count: m.cellCount,
    },
  };
}

export function mastFeatureCollectionJson(list: { items: MastSummary[]; truncated: boolean }): MastFeatureCollectionJson {
  return { type: 'FeatureCollection', features: list.items.map(mastFeatureJson), truncated: list.truncated };
}
