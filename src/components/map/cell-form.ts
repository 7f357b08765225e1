// The cell form's text fields and what they become in an API body, and the band a channel number
// falls in, shown while typing. Pure: the form checks the result with the API's own schema.
import { isKnownBand, listBands, lookupChannel } from '../../lib/domain/channels';
import type { CellBody } from '../../lib/client/masts-api';
import type { CellJson } from '../../lib/schemas/masts';
import type { Tech } from '../../lib/schemas/mast-enums';
import { readNumber } from './mast-form';

const NUMBER_KEYS = ['channel', 'pci', 'sector_azimuth_deg', 'antenna_height_m', 'bandwidth_mhz', 'rs_power_dbm', 'cell_identity'] as const;
type NumberKey = (typeof NUMBER_KEYS)[number];

export type CellDraft = Record<NumberKey, string> & {
  operator_id: string;
  tech: Tech;
  /** Blank: the band the channel number falls in. */
  band: string;
};

const numText = (v: number | null) => (v === null ? '' : String(v));

export function newCellDraft(operatorId: string): CellDraft {
  return {
    operator_id: operatorId,
    tech: 'lte',
    band: '',
    channel: '',
    pci: '',
    sector_azimuth_deg: '',
    antenna_height_m: '',
    bandwidth_mhz: '',
    rs_power_dbm: '15.2',
    cell_identity: '',
  };
}

export function cellDraftOf(c: CellJson): CellDraft {
  return {
    operator_id: c.operator.id,
    tech: c.tech,
    band: c.band,
    channel: String(c.channel),
    pci: numText(c.pci),
    sector_azimuth_deg: numText(c.sector_azimuth_deg),
    antenna_height_m: numText(c.antenna_height_m),
    bandwidth_mhz: numText(c.bandwidth_mhz),
    rs_power_dbm: String(c.rs_power_dbm),
    cell_identity: numText(c.cell_identity),
  };
}

/** The body of POST /api/masts/:id/cells (also what an edited cell must satisfy as a whole). */
export function cellInputOf(d: CellDraft): CellBody {
  const body: Record<string, unknown> = { operator_id: d.operator_id, tech: d.tech, band: d.band.trim() === '' ? null : d.band };
  for (const k of NUMBER_KEYS) body[k] = readNumber(d[k], k !== 'channel' && k !== 'rs_power_dbm');
  // As typed; CellInputSchema checks it before it is sent.
  return body as CellBody;
}

/** The fields that differ from the stored cell, in the API's names. */
export function changedCellFields(before: CellDraft, after: CellDraft): Record<string, unknown> {
  const whole = cellInputOf(after);
  const out: Record<string, unknown> = {};
  for (const k of Object.keys(whole) as (keyof CellDraft)[]) if (after[k] !== before[k]) out[k] = whole[k];
  return out;
}

/** Band choices for a technology, in the tables' order. */
export function bandChoices(tech: Tech): string[] {
  return listBands(tech).map((b) => b.band);
}

/** The band kept when the technology changes: the same label if that technology has it, else blank. */
export function bandForTech(tech: Tech, band: string): string {
  return band !== '' && isKnownBand(tech, band) ? band : '';
}

/** "Band B20 · 806.0 MHz down" for a channel number that resolves, else null (the schema names the fault). */
export function describeChannel(tech: Tech, channelText: string, band: string): string | null {
  const channel = readNumber(channelText, false);
  if (typeof channel !== 'number' || !Number.isInteger(channel)) return null;
  try {
    const info = lookupChannel(tech, channel, band ? { band } : {});
    return `Band ${info.band} · ${info.dlMhz.toFixed(1)} MHz down`;
  } catch {
    return null;
  }
}
