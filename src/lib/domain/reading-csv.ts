/**
 * The survey-log CSV Bearline imports: its columns, and the checks of one row against the
 * measurement ranges (measurements.ts) and the band tables (channels.ts). Pure: `now` comes in.
 */
import { ChannelError, lookupChannel, type RadioTech } from './channels';
import { validateMeasurement, type MeasurementKind } from './measurements';
import { getDestination } from './geodesy';

export interface ReadingCsvColumn {
  name: string;
  required: boolean;
  description: string;
}

/** The documented column set, in the order of the sample file. Header names are case-insensitive. */
export const READING_CSV_COLUMNS: readonly ReadingCsvColumn[] = [
  { name: 'time', required: true, description: 'ISO 8601 date and time with a zone, e.g. 2026-11-30T09:15:02Z' },
  { name: 'lat', required: true, description: 'WGS84 latitude, decimal degrees' },
  { name: 'lon', required: true, description: 'WGS84 longitude, decimal degrees' },
  { name: 'tech', required: true, description: 'gsm, umts, lte or nr' },
  { name: 'channel', required: true, description: 'ARFCN, UARFCN, EARFCN or NR-ARFCN of the serving cell' },
  { name: 'pci', required: false, description: 'PCI (LTE 0–503, NR 0–1007), scrambling code (UMTS 0–511) or BSIC (GSM 0–63)' },
  { name: 'rsrp_dbm', required: false, description: 'RSRP (LTE) or SS-RSRP (NR), dBm' },
  { name: 'rsrq_db', required: false, description: 'RSRQ (LTE) or SS-RSRQ (NR), dB' },
  { name: 'sinr_db', required: false, description: 'SINR (LTE RSSNR) or SS-SINR (NR), dB' },
  { name: 'rssi_dbm', required: false, description: 'RSSI, dBm' },
  { name: 'mcc', required: false, description: 'Mobile country code (3 digits); with mnc, only that operator’s cells match' },
  { name: 'mnc', required: false, description: 'Mobile network code (2 or 3 digits)' },
  { name: 'device', required: false, description: 'Label of the phone or router that measured' },
  { name: 'antenna_gain_dbi', required: false, description: 'Gain of an external antenna, dBi (empty: the device’s own)' },
  { name: 'height_m', required: false, description: 'Antenna height above ground, m' },
];

export const READING_CSV_REQUIRED = READING_CSV_COLUMNS.filter((c) => c.required).map((c) => c.name);

export const READING_TECHS: readonly RadioTech[] = ['gsm', 'umts', 'lte', 'nr'];

// PCI ranges: LTE 504 (3GPP TS 36.211 §6.11), NR 1008 (TS 38.211 §7.4.2.1); UMTS primary scrambling
// codes 0–511 (TS 25.213 §5.2.2); GSM BSIC 6 bits (TS 23.003 §4.3.2).
const PCI_MAX: Record<RadioTech, number> = { lte: 503, nr: 1007, umts: 511, gsm: 63 };

// Which range each column is checked against, per technology; null means the column must be empty.
const KINDS: Record<RadioTech, Record<'rsrp_dbm' | 'rsrq_db' | 'sinr_db' | 'rssi_dbm', MeasurementKind | null>> = {
  lte: { rsrp_dbm: 'lteRsrp', rsrq_db: 'lteRsrq', sinr_db: 'lteSinr', rssi_dbm: 'lteRssi' },
  nr: { rsrp_dbm: 'nrSsRsrp', rsrq_db: 'nrSsRsrq', sinr_db: 'nrSsSinr', rssi_dbm: 'lteRssi' },
  // 2G/3G report RSSI (RSCP for UMTS) only; the RSSI plausibility window applies.
  umts: { rsrp_dbm: null, rsrq_db: null, sinr_db: null, rssi_dbm: 'lteRssi' },
  gsm: { rsrp_dbm: null, rsrq_db: null, sinr_db: null, rssi_dbm: 'lteRssi' },
};

// Plausibility windows, common practice: survey antennas from a phone's own (about 0 dBi, less
// indoors) to a large panel or yagi; masts for a survey antenna rarely above 100 m.
const GAIN_DBI = { min: -10, max: 30 };
const HEIGHT_M = { min: 0, max: 300 };
/** A reading may be stamped at most this far in the future (clock drift between devices). */
const FUTURE_SLACK_MS = 24 * 3600 * 1000;

export interface ReadingCsvRow {
  takenAt: Date;
  lat: number;
  lon: number;
  tech: RadioTech;
  channel: number;
  pci: number | null;
  rsrpDbm: number | null;
  rsrqDb: number | null;
  sinrDb: number | null;
  rssiDbm: number | null;
  mcc: string | null;
  mnc: string | null;
  device: string | null;
  antennaGainDbi: number | null;
  heightM: number | null;
}

export type ReadingRowCheck = { ok: true; row: ReadingCsvRow } | { ok: false; messages: string[] };

const NUMBER = /^[-+]?(\d+\.?\d*|\.\d+)$/;
const ISO_TIME = /^\d{4}-\d{2}-\d{2}[T ]\d{2}:\d{2}(:\d{2}(\.\d{1,6})?)?(Z|[+-]\d{2}:?\d{2})$/i;

/** Missing required columns, as a message per problem (empty when the header is usable). */
export function checkReadingCsvHeader(header: readonly string[]): string[] {
  const missing = READING_CSV_REQUIRED.filter((c) => !header.includes(c));
  const hasValue = ['rsrp_dbm', 'rsrq_db', 'sinr_db', 'rssi_dbm'].some((c) => header.includes(c));
  const messages: string[] = [];
  if (missing.length) messages.push(`Missing column${missing.length > 1 ? 's' : ''}: ${missing.join(', ')} (see the sample file for the column set)`);
  if (!hasValue) messages.push('No measurement column: give at least one of rsrp_dbm, rsrq_db, sinr_db, rssi_dbm');
  return messages;
}

/** One CSV record (lower-cased column → text) checked and typed. */
export function checkReadingCsvRow(record: Readonly<Record<string, string | undefined>>, now: Date): ReadingRowCheck {
  const messages: string[] = [];
  const text = (name: string) => (record[name] ?? '').trim();
  const num = (name: string, required: boolean): number | null => {
    const s = text(name);
    if (!s) {
      if (required) messages.push(`${name} is empty`);
      return null;
    }
    if (!NUMBER.test(s)) {
      messages.push(`${name} must be a number`);
      return null;
    }
    return Number(s);
  };

  let takenAt: Date | null = null;
  const time = text('time');
  if (!time) messages.push('time is empty');
  else if (!ISO_TIME.test(time) || Number.isNaN(Date.parse(time.replace(' ', 'T')))) {
    messages.push('time must be ISO 8601 with a zone, e.g. 2026-11-30T09:15:02Z');
  } else {
    takenAt = new Date(time.replace(' ', 'T'));
    if (takenAt.getTime() > now.getTime() + FUTURE_SLACK_MS) messages.push('time is in the future');
  }

  const lat = num('lat', true);
  const lon = num('lon', true);
  if (lat !== null && Math.abs(lat) > 90) messages.push('lat must be between -90 and 90');
  if (lon !== null && Math.abs(lon) > 180) messages.push('lon must be between -180 and 180');

  const techText = text('tech').toLowerCase();
  const tech = (READING_TECHS as readonly string[]).includes(techText) ? (techText as RadioTech) : null;
  if (!tech) messages.push(techText ? `tech must be one of ${READING_TECHS.join(', ')}` : 'tech is empty');

  const channel = num('channel', true);
  if (channel !== null && tech) {
    try {
      lookupChannel(tech, channel);
    } catch (err) {
      messages.push(err instanceof ChannelError ? err.message : `channel ${channel} is not valid`);
    }
  }

  const pci = num('pci', tech === 'lte' || tech === 'nr');
  if (pci !== null && tech && (!Number.isInteger(pci) || pci < 0 || pci > PCI_MAX[tech])) {
    messages.push(`pci must be a whole number 0 … ${PCI_MAX[tech]} for ${tech}`);
  }

  const values: Record<'rsrp_dbm' | 'rsrq_db' | 'sinr_db' | 'rssi_dbm', number | null> = {
    rsrp_dbm: num('rsrp_dbm', false),
    rsrq_db: num('rsrq_db', false),
    sinr_db: num('sinr_db', false),
    rssi_dbm: num('rssi_dbm', false),
  };
  if (Object.values(values).every((v) => v === null) && !Object.keys(values).some((k) => text(k))) {
    messages.push('no measurement: give at least one of rsrp_dbm, rsrq_db, sinr_db, rssi_dbm');
  }
  if (tech) {
    for (const [column, value] of Object.entries(values) as Array<[keyof typeof values, number | null]>) {
      if (value === null) continue;
      const kind = KINDS[tech][column];
      if (!kind) {
        messages.push(`${column} is not measured on ${tech}; leave it empty`);
        continue;
      }
      const check = validateMeasurement(kind, value);
      if (!check.ok) messages.push(check.message);
    }
  }

  const mcc = text('mcc') || null;
  const mnc = text('mnc') || null;
  if (mcc !== null && !/^\d{3}$/.test(mcc)) messages.push('mcc must be 3 digits');
  if (mnc !== null && !/^\d{2,3}$/.test(mnc)) messages.push('mnc must be 2 or 3 digits');
  if ((mcc === null) !== (mnc === null)) messages.push('give mcc and mnc together, or neither');

  const device = text('device') || null;
  if (device !== null && device.length > 100) messages.push('device is longer than 100 characters');

  const antennaGainDbi = num('antenna_gain_dbi', false);
  if (antennaGainDbi !== null && (antennaGainDbi < GAIN_DBI.min || antennaGainDbi > GAIN_DBI.max)) {
    messages.push(`antenna_gain_dbi must be between ${GAIN_DBI.min} and ${GAIN_DBI.max}`);
  }
  const heightM = num('height_m', false);
  if (heightM !== null && (heightM < HEIGHT_M.min || heightM > HEIGHT_M.max)) {
    messages.push(`height_m must be between ${HEIGHT_M.min} and ${HEIGHT_M.max}`);
  }

  if (messages.length || !takenAt || lat === null || lon === null || !tech || channel === null) {
    return { ok: false, messages: messages.length ? messages : ['the row is incomplete'] };
  }
  return {
    ok: true,
    row: {
      takenAt,
      lat,
      lon,
      tech,
      channel,
      pci,
      rsrpDbm: values.rsrp_dbm,
      rsrqDb: values.rsrq_db,
      sinrDb: values.sinr_db,
      rssiDbm: values.rssi_dbm,
      mcc,
      mnc,
      device,
      antennaGainDbi,
      heightM,
    },
  };
}

/** A cell the sample log is made around: its mast's position, operator codes and sector. */
export interface SampleCell {
  tech: RadioTech;
  channel: number;
  pci: number;
  mcc: string;
  mnc: string;
  lat: number;
  lon: number;
  sectorAzimuthDeg: number | null;
}

/** Distances from the mast, along its sector's azimuth, of the sample rows for each cell. */
const SAMPLE_DISTANCES_M = [600, 1500] as const;
const SAMPLE_START = Date.UTC(2026, 10, 30, 9, 15, 0);

function sampleRow(cell: SampleCell, index: number, step: number): string {
  const at = getDestination({ lat: cell.lat, lon: cell.lon }, SAMPLE_DISTANCES_M[step]!, cell.sectorAzimuthDeg ?? 0);
  const time = new Date(SAMPLE_START + index * 37_000).toISOString().replace('.000Z', 'Z');
  const position = `${at.lat.toFixed(5)},${at.lon.toFixed(5)}`;
  // Plausible values a little weaker further out: LTE/NR RSRP, RSRQ, SINR; UMTS RSSI only.
  const radio = cell.tech === 'umts' ? `,,,${-70 - 8 * step}` : `${-82 - 12 * step},${-10 - 2 * step},${12 - 7 * step},`;
  return `${time},${position},${cell.tech},${cell.channel},${cell.pci},${radio},${cell.mcc},${cell.mnc},Survey phone A,,1.5`;
}

/**
 * A small survey log in the documented format. Given cells, two readings in the sector of each
 * (600 m and 1.5 km out along its azimuth), so that importing it matches every row; without cells,
 * a few invented rows on the demo island's waters (fictional, test network MCC 001).
 */
export function buildSampleReadingCsv(cells: readonly SampleCell[] = []): string {
  const header = READING_CSV_COLUMNS.map((c) => c.name).join(',');
  const rows = cells.length
    ? cells.flatMap((cell, i) => SAMPLE_DISTANCES_M.map((_, step) => sampleRow(cell, i * SAMPLE_DISTANCES_M.length + step, step)))
    : [
        '2026-11-30T09:15:02Z,-47.2102,-128.5121,lte,6300,101,-97,-11.5,8,-68,001,01,Survey phone A,,1.5',
        '2026-11-30T09:15:07Z,-47.2110,-128.5133,lte,6300,101,-99,-12,6.5,,001,01,Survey phone A,,1.5',
        '2026-11-30T09:16:40Z,-47.2175,-128.5260,lte,1300,17,-108,-15.5,1,,001,01,Survey phone A,,1.5',
        '2026-11-30T09:21:12Z,-47.2301,-128.5402,nr,641280,900,-104,-12.5,4.5,,001,02,Roof router B,9,6',
        '2026-11-30T09:25:55Z,-47.2388,-128.5519,umts,10700,215,,,,-81,001,03,Survey phone A,,1.5',
      ];
  return [header, ...rows].join('\n') + '\n';
}
