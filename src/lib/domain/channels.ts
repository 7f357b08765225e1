/**
 * Channel numbers ↔ bands and carrier frequencies for LTE (EARFCN), 5G NR (NR-ARFCN), UMTS (UARFCN) and
 * GSM (ARFCN). Sources per table below; rows marked `from memory, verify` were not read from the
 * standard itself (the published rows come from 3GPP TS 36.101 Table 5.7.3-1, TS 38.104 Tables 5.2-1 and
 * 5.4.2.3-1, TS 25.101 Table 5.1 and TS 45.005 §2).
 */

export type RadioTech = 'lte' | 'nr' | 'umts' | 'gsm';
export type Duplex = 'FDD' | 'TDD' | 'SDL';
/** The link a channel number or frequency belongs to; `both` for TDD and for GSM's paired ARFCN. */
export type LinkDirection = 'DL' | 'UL' | 'both';
export type Provenance = 'published' | 'from memory, verify';

export interface MhzRange {
  low: number;
  high: number;
}

export interface ChannelRange {
  first: number;
  last: number;
}

export interface BandSummary {
  tech: RadioTech;
  band: string;
  duplex: Duplex;
  /** Operating-band edges. */
  dlMhz: MhzRange;
  ulMhz: MhzRange | null;
  dlChannels: ChannelRange[];
  ulChannels: ChannelRange[] | null;
  provenance: Provenance;
}

export interface ChannelInfo {
  tech: RadioTech;
  channel: number;
  band: string;
  duplex: Duplex;
  /** Which link the given number denotes. */
  direction: LinkDirection;
  dlChannel: number;
  dlMhz: number;
  /** Paired uplink; null for SDL bands and for downlink channels above a band's uplink block. */
  ulChannel: number | null;
  ulMhz: number | null;
  /** Other bands that contain the same number, most likely first. */
  alternativeBands: string[];
  notes: string[];
}

export interface FrequencyCandidate {
  tech: RadioTech;
  band: string;
  channel: number;
  direction: LinkDirection;
  /** False when the frequency is off the channel raster and `channel` is only the nearest one. */
  exact: boolean;
}

export type ChannelErrorCode = 'INVALID_CHANNEL' | 'NO_BAND' | 'UNKNOWN_BAND' | 'NOT_IN_BAND';

export class ChannelError extends Error {
  readonly code: ChannelErrorCode;

  constructor(code: ChannelErrorCode, message: string) {
    super(message);
    this.name = 'ChannelError';
    this.code = code;
  }
}

const CHANNEL_NAME: Record<RadioTech, string> = { lte: 'EARFCN', nr: 'NR-ARFCN', umts: 'UARFCN', gsm: 'ARFCN' };
const TECH_NAME: Record<RadioTech, string> = { lte: 'LTE', nr: 'NR', umts: 'UMTS', gsm: 'GSM' };

interface BandDef {
  tech: RadioTech;
  band: string;
  /** Normalised labels accepted by `isChannelInBand` and the `band` option, besides `band` itself. */
  aliases: string[];
  duplex: Duplex;
  dlMhz: MhzRange;
  ulMhz: MhzRange | null;
  dl: ChannelRange[];
  ul: ChannelRange[] | null;
  /** Lower ranks are preferred when a number lies in several bands. */
  rank: number;
  provenance: Provenance;
  getDlMhz(channel: number): number;
  getUlMhz(channel: number): number;
  /** Fractional channel number of a frequency; callers round and range-check it. */
  getDlChannel(mhz: number): number;
  getUlChannel(mhz: number): number;
  getUlFromDl(dlChannel: number): number | null;
  getDlFromUl(ulChannel: number): number;
  /** NR only: whether a number sits on the band's DL or UL channel raster (SSB positions often do not). */
  isOnChannelRaster?(channel: number, isDl: boolean): boolean;
}

/** Decimal MHz without binary noise (1e-6 MHz = 1 Hz). */
function roundMhz(mhz: number): number {
  return Math.round(mhz * 1e6) / 1e6;
}

function isIn(ranges: ChannelRange[] | null, channel: number): boolean {
  return ranges !== null && ranges.some((r) => channel >= r.first && channel <= r.last);
}

function normaliseLabel(label: string): string {
  return label
    .trim()
    .toUpperCase()
    .replace(/^BAND/, '')
    .replace(/[\s_-]/g, '');
}

// ---------------------------------------------------------------------------------------------------------
// LTE — 3GPP TS 36.101 §5.7.3, Table 5.7.3-1: F = F_low + 0.1·(N − N_Offs) [MHz].

interface LteRow {
  band: number;
  duplex: Duplex;
  fDlLow: number;
  nOffsDl: number;
  nDlLast: number;
  ul?: { fUlLow: number; nOffsUl: number; nUlLast: number };
  provenance: Provenance;
}

// Published rows: 3GPP TS 36.101 Table 5.7.3-1 (= TS 36.521-1 Table 5.4.4-1), matching open-source tables. Memory rows: band
// offsets also match one open-source implementation's table, ranges derived from the band edges.
const LTE_ROWS: LteRow[] = [
  { band: 1, duplex: 'FDD', fDlLow: 2110, nOffsDl: 0, nDlLast: 599, ul: { fUlLow: 1920, nOffsUl: 18000, nUlLast: 18599 }, provenance: 'published' },
  {
    band: 2,
    duplex: 'FDD',
    fDlLow: 1930,
    nOffsDl: 600,
    nDlLast: 1199,
    ul: { fUlLow: 1850, nOffsUl: 18600, nUlLast: 19199 },
    provenance: 'from memory, verify',
  },
  { band: 3, duplex: 'FDD', fDlLow: 1805, nOffsDl: 1200, nDlLast: 1949, ul: { fUlLow: 1710, nOffsUl: 19200, nUlLast: 19949 }, provenance: 'published' },
  {
    band: 4,
    duplex: 'FDD',
    fDlLow: 2110,
    nOffsDl: 1950,
    nDlLast: 2399,
    ul: { fUlLow: 1710, nOffsUl: 19950, nUlLast: 20399 },
    provenance: 'from memory, verify',
  },
  { band: 5, duplex: 'FDD', fDlLow: 869, nOffsDl: 2400, nDlLast: 2649, ul: { fUlLow: 824, nOffsUl: 20400, nUlLast: 20649 }, provenance: 'from memory, verify' },
  { band: 7, duplex: 'FDD', fDlLow: 2620, nOffsDl: 2750, nDlLast: 3449, ul: { fUlLow: 2500, nOffsUl: 20750, nUlLast: 21449 }, provenance: 'published' },
  { band: 8, duplex: 'FDD', fDlLow: 925, nOffsDl: 3450, nDlLast: 3799, ul: { fUlLow: 880, nOffsUl: 21450, nUlLast: 21799 }, provenance: 'published' },
  {
    band: 12,
    duplex: 'FDD',
    fDlLow: 729,
    nOffsDl: 5010,
    nDlLast: 5179,
    ul: { fUlLow: 699, nOffsUl: 23010, nUlLast: 23179 },
    provenance: 'from memory, verify',
  },
  {
    band: 13,
    duplex: 'FDD',
    fDlLow: 746,
    nOffsDl: 5180,
    nDlLast: 5279,
    ul: { fUlLow: 777, nOffsUl: 23180, nUlLast: 23279 },
    provenance: 'from memory, verify',
  },
  {
    band: 14,
    duplex: 'FDD',
    fDlLow: 758,
    nOffsDl: 5280,
    nDlLast: 5379,
    ul: { fUlLow: 788, nOffsUl: 23280, nUlLast: 23379 },
    provenance: 'from memory, verify',
  },
  {
    band: 17,
    duplex: 'FDD',
    fDlLow: 734,
    nOffsDl: 5730,
    nDlLast: 5849,
    ul: { fUlLow: 704, nOffsUl: 23730, nUlLast: 23849 },
    provenance: 'from memory, verify',
  },
  { band: 19, duplex: 'FDD', fDlLow: 875, nOffsDl: 6000, nDlLast: 6149, ul: { fUlLow: 830, nOffsUl: 24000, nUlLast: 24149 }, provenance: 'published' },
  // Band 20 is "reverse" duplex: the uplink lies above the downlink.
  { band: 20, duplex: 'FDD', fDlLow: 791, nOffsDl: 6150, nDlLast: 6449, ul: { fUlLow: 832, nOffsUl: 24150, nUlLast: 24449 }, provenance: 'published' },
  {
    band: 25,
    duplex: 'FDD',
    fDlLow: 1930,
    nOffsDl: 8040,
    nDlLast: 8689,
    ul: { fUlLow: 1850, nOffsUl: 26040, nUlLast: 26689 },
    provenance: 'from memory, verify',
  },
  {
    band: 26,
    duplex: 'FDD',
    fDlLow: 859,
    nOffsDl: 8690,
    nDlLast: 9039,
    ul: { fUlLow: 814, nOffsUl: 26690, nUlLast: 27039 },
    provenance: 'from memory, verify',
  },
  { band: 28, duplex: 'FDD', fDlLow: 758, nOffsDl: 9210, nDlLast: 9659, ul: { fUlLow: 703, nOffsUl: 27210, nUlLast: 27659 }, provenance: 'published' },
  { band: 29, duplex: 'SDL', fDlLow: 717, nOffsDl: 9660, nDlLast: 9769, provenance: 'from memory, verify' },
  { band: 32, duplex: 'SDL', fDlLow: 1452, nOffsDl: 9920, nDlLast: 10359, provenance: 'published' },
  { band: 38, duplex: 'TDD', fDlLow: 2570, nOffsDl: 37750, nDlLast: 38249, provenance: 'published' },
  { band: 39, duplex: 'TDD', fDlLow: 1880, nOffsDl: 38250, nDlLast: 38649, provenance: 'from memory, verify' },
  { band: 40, duplex: 'TDD', fDlLow: 2300, nOffsDl: 38650, nDlLast: 39649, provenance: 'published' },
  { band: 41, duplex: 'TDD', fDlLow: 2496, nOffsDl: 39650, nDlLast: 41589, provenance: 'published' },
  { band: 42, duplex: 'TDD', fDlLow: 3400, nOffsDl: 41590, nDlLast: 43589, provenance: 'published' },
  { band: 43, duplex: 'TDD', fDlLow: 3600, nOffsDl: 43590, nDlLast: 45589, provenance: 'published' },
  { band: 48, duplex: 'TDD', fDlLow: 3550, nOffsDl: 55240, nDlLast: 56739, provenance: 'from memory, verify' },
  // Bands ≥ 65 use the extended EARFCN range (above 65535). Band 66's downlink is 20 MHz wider than its
  // uplink; the top downlink channels have no paired uplink.
  {
    band: 66,
    duplex: 'FDD',
    fDlLow: 2110,
    nOffsDl: 66436,
    nDlLast: 67335,
    ul: { fUlLow: 1710, nOffsUl: 131972, nUlLast: 132671 },
    provenance: 'from memory, verify',
  },
  {
    band: 71,
    duplex: 'FDD',
    fDlLow: 617,
    nOffsDl: 68586,
    nDlLast: 68935,
    ul: { fUlLow: 663, nOffsUl: 133122, nUlLast: 133471 },
    provenance: 'from memory, verify',
  },
];

function createLteBand(row: LteRow, index: number): BandDef {
  const dlTenths = Math.round(row.fDlLow * 10);
  const dlWidthTenths = row.nDlLast - row.nOffsDl + 1;
  const ul = row.ul;
  const ulTenths = ul ? Math.round(ul.fUlLow * 10) : 0;
  const getDlMhz = (n: number) => (dlTenths + (n - row.nOffsDl)) / 10;
  const getUlMhz = (n: number) => (ul ? (ulTenths + (n - ul.nOffsUl)) / 10 : Number.NaN);
  const dl = [{ first: row.nOffsDl, last: row.nDlLast }];
  const tdd = row.duplex === 'TDD';
  const ulRanges = ul ? [{ first: ul.nOffsUl, last: ul.nUlLast }] : tdd ? dl : null;
  const dlMhz = { low: row.fDlLow, high: (dlTenths + dlWidthTenths) / 10 };
  const ulMhz = ul ? { low: ul.fUlLow, high: (ulTenths + ul.nUlLast - ul.nOffsUl + 1) / 10 } : tdd ? dlMhz : null;
  return {
    tech: 'lte',
    band: `B${row.band}`,
    aliases: [String(row.band), `B${row.band}`],
    duplex: row.duplex,
    dlMhz,
    ulMhz,
    dl,
    ul: ulRanges,
    rank: index,
    provenance: row.provenance,
    getDlMhz,
    getUlMhz: tdd ? getDlMhz : getUlMhz,
    getDlChannel: (mhz) => 10 * mhz - dlTenths + row.nOffsDl,
    getUlChannel: (mhz) => (ul ? 10 * mhz - ulTenths + ul.nOffsUl : tdd ? 10 * mhz - dlTenths + row.nOffsDl : Number.NaN),
    getUlFromDl: (n) => {
      if (tdd) return n;
      if (!ul) return null;
      const ulChannel = n - row.nOffsDl + ul.nOffsUl;
      return ulChannel <= ul.nUlLast ? ulChannel : null;
    },
    getDlFromUl: (n) => (ul ? n - ul.nOffsUl + row.nOffsDl : n),
  };
}

// ---------------------------------------------------------------------------------------------------------
// NR — global frequency raster, 3GPP TS 38.104 §5.4.2.1 Table 5.4.2.1-1: F = F_REF-Offs + ΔF·(N − N_REF-Offs).

export const NR_ARFCN_MAX = 3_279_165;

/** Carrier (or SSB) frequency of an NR-ARFCN on the global raster, MHz. */
export function getNrArfcnFrequencyMhz(arfcn: number): number {
  assertChannelNumber('nr', arfcn);
  if (arfcn > NR_ARFCN_MAX) throw noGlobalRaster(arfcn);
  if (arfcn < 600_000) return (arfcn * 5) / 1000;
  if (arfcn < 2_016_667) return 3000 + ((arfcn - 600_000) * 15) / 1000;
  return (2_425_008 + 6 * (arfcn - 2_016_667)) / 100;
}

/** Fractional NR-ARFCN of a frequency (round it for the nearest raster point). */
function getNrArfcnExact(mhz: number): number {
  if (mhz < 3000) return mhz / 0.005;
  if (mhz < 24_250) return 600_000 + (mhz - 3000) / 0.015;
  return 2_016_667 + (mhz - 24_250.08) / 0.06;
}

/** Nearest NR-ARFCN on the global raster for a frequency in MHz (0 – 100 000 MHz). */
export function getNrArfcnForFrequency(mhz: number): number {
  if (!(mhz >= 0 && mhz <= 100_000)) throw new ChannelError('NO_BAND', `${mhz} MHz is outside the NR global frequency raster (0–100000 MHz)`);
  return Math.round(getNrArfcnExact(mhz));
}

/**
 * SS/PBCH block reference frequency of a GSCN, TS 38.104 §5.4.3.1 Table 5.4.3.1-1.
 * GSCN ranges 2–7498 / 7499–22255 / 22256–26639 are from memory, verify.
 */
export function getGscnFrequencyMhz(gscn: number): number {
  if (!Number.isInteger(gscn) || gscn < 2 || gscn > 26_639) {
    throw new ChannelError('INVALID_CHANNEL', `GSCN ${gscn} is outside the synchronisation raster (2–26639)`);
  }
  if (gscn < 7499) {
    const n = Math.round(gscn / 3);
    const m = 2 * (gscn - 3 * n) + 3; // GSCN = 3N + (M − 3)/2, M ∈ {1, 3, 5}
    return roundMhz(n * 1.2 + m * 0.05);
  }
  if (gscn < 22_256) return roundMhz(3000 + (gscn - 7499) * 1.44);
  return roundMhz(24_250.08 + (gscn - 22_256) * 17.28);
}

interface NrRaster {
  first: number;
  step: number;
  last: number;
}

interface NrRow {
  band: number;
  duplex: Duplex;
  /** Operating-band edges, TS 38.104 Table 5.2-1/5.2-2; the last ARFCN of a 15 kHz raster sits 5 kHz below. */
  dlMhz: MhzRange;
  ulMhz?: MhzRange;
  dl: NrRaster[];
  ul?: NrRaster[];
  /** Single extra allowed values off the step grid (n28's 40 MHz carrier). */
  extra?: number[];
  provenance: Provenance;
}

const step20 = (first: number, last: number): NrRaster[] => [{ first, step: 20, last }];

// Published rows: 3GPP TS 38.104 (Tables 5.2-1 and 5.4.2.3-1/-2, as quoted by an open-source gNB).
// Memory rows: FR1 ranges also match that implementation; FR2 n257/n260/n261 convert to their band edges.
const NR_ROWS: NrRow[] = [
  {
    band: 1,
    duplex: 'FDD',
    dlMhz: { low: 2110, high: 2170 },
    ulMhz: { low: 1920, high: 1980 },
    dl: step20(422_000, 434_000),
    ul: step20(384_000, 396_000),
    provenance: 'published',
  },
  {
    band: 2,
    duplex: 'FDD',
    dlMhz: { low: 1930, high: 1990 },
    ulMhz: { low: 1850, high: 1910 },
    dl: step20(386_000, 398_000),
    ul: step20(370_000, 382_000),
    provenance: 'from memory, verify',
  },
  {
    band: 3,
    duplex: 'FDD',
    dlMhz: { low: 1805, high: 1880 },
    ulMhz: { low: 1710, high: 1785 },
    dl: step20(361_000, 376_000),
    ul: step20(342_000, 357_000),
    provenance: 'published',
  },
  {
    band: 5,
    duplex: 'FDD',
    dlMhz: { low: 869, high: 894 },
    ulMhz: { low: 824, high: 849 },
    dl: step20(173_800, 178_800),
    ul: step20(164_800, 169_800),
    provenance: 'from memory, verify',
  },
  {
    band: 7,
    duplex: 'FDD',
    dlMhz: { low: 2620, high: 2690 },
    ulMhz: { low: 2500, high: 2570 },
    dl: step20(524_000, 538_000),
    ul: step20(500_000, 514_000),
    provenance: 'published',
  },
  {
    band: 8,
    duplex: 'FDD',
    dlMhz: { low: 925, high: 960 },
    ulMhz: { low: 880, high: 915 },
    dl: step20(185_000, 192_000),
    ul: step20(176_000, 183_000),
    provenance: 'published',
  },
  {
    band: 12,
    duplex: 'FDD',
    dlMhz: { low: 729, high: 746 },
    ulMhz: { low: 699, high: 716 },
    dl: step20(145_800, 149_200),
    ul: step20(139_800, 143_200),
    provenance: 'from memory, verify',
  },
  {
    band: 20,
    duplex: 'FDD',
    dlMhz: { low: 791, high: 821 },
    ulMhz: { low: 832, high: 862 },
    dl: step20(158_200, 164_200),
    ul: step20(166_400, 172_400),
    provenance: 'published',
  },
  {
    band: 25,
    duplex: 'FDD',
    dlMhz: { low: 1930, high: 1995 },
    ulMhz: { low: 1850, high: 1915 },
    dl: step20(386_000, 399_000),
    ul: step20(370_000, 383_000),
    provenance: 'from memory, verify',
  },
  {
    band: 28,
    duplex: 'FDD',
    dlMhz: { low: 758, high: 803 },
    ulMhz: { low: 703, high: 748 },
    dl: step20(151_600, 160_600),
    ul: step20(140_600, 149_600),
    extra: [155_608],
    provenance: 'published',
  },
  { band: 38, duplex: 'TDD', dlMhz: { low: 2570, high: 2620 }, dl: step20(514_000, 524_000), provenance: 'published' },
  { band: 40, duplex: 'TDD', dlMhz: { low: 2300, high: 2400 }, dl: step20(460_000, 480_000), provenance: 'published' },
  {
    band: 41,
    duplex: 'TDD',
    dlMhz: { low: 2496, high: 2690 },
    dl: [
      { first: 499_200, step: 3, last: 537_999 },
      { first: 499_200, step: 6, last: 537_996 },
    ],
    provenance: 'published',
  },
  { band: 48, duplex: 'TDD', dlMhz: { low: 3550, high: 3700 }, dl: [{ first: 636_667, step: 1, last: 646_666 }], provenance: 'from memory, verify' },
  {
    band: 66,
    duplex: 'FDD',
    dlMhz: { low: 2110, high: 2200 },
    ulMhz: { low: 1710, high: 1780 },
    dl: step20(422_000, 440_000),
    ul: step20(342_000, 356_000),
    provenance: 'from memory, verify',
  },
  {
    band: 71,
    duplex: 'FDD',
    dlMhz: { low: 617, high: 652 },
    ulMhz: { low: 663, high: 698 },
    dl: step20(123_400, 130_400),
    ul: step20(132_600, 139_600),
    provenance: 'from memory, verify',
  },
  { band: 77, duplex: 'TDD', dlMhz: { low: 3300, high: 4200 }, dl: [{ first: 620_000, step: 1, last: 680_000 }], provenance: 'published' },
  { band: 78, duplex: 'TDD', dlMhz: { low: 3300, high: 3800 }, dl: [{ first: 620_000, step: 1, last: 653_333 }], provenance: 'published' },
  { band: 79, duplex: 'TDD', dlMhz: { low: 4400, high: 5000 }, dl: [{ first: 693_334, step: 1, last: 733_333 }], provenance: 'from memory, verify' },
  { band: 257, duplex: 'TDD', dlMhz: { low: 26500, high: 29500 }, dl: [{ first: 2_054_166, step: 1, last: 2_104_165 }], provenance: 'from memory, verify' },
  { band: 258, duplex: 'TDD', dlMhz: { low: 24250, high: 27500 }, dl: [{ first: 2_016_667, step: 1, last: 2_070_832 }], provenance: 'published' },
  { band: 260, duplex: 'TDD', dlMhz: { low: 37000, high: 40000 }, dl: [{ first: 2_229_166, step: 1, last: 2_279_165 }], provenance: 'from memory, verify' },
  { band: 261, duplex: 'TDD', dlMhz: { low: 27500, high: 28350 }, dl: [{ first: 2_070_833, step: 1, last: 2_084_999 }], provenance: 'from memory, verify' },
];

function spanOf(rasters: NrRaster[]): ChannelRange {
  return { first: Math.min(...rasters.map((r) => r.first)), last: Math.max(...rasters.map((r) => r.last)) };
}

function createNrBand(row: NrRow): BandDef {
  const dlSpan = spanOf(row.dl);
  const ulSpan = row.ul ? spanOf(row.ul) : null;
  const { dlMhz } = row;
  const ulMhz = row.ulMhz ?? null;
  const tdd = row.duplex === 'TDD';
  const duplexGapMhz = ulMhz ? dlMhz.low - ulMhz.low : 0;
  return {
    tech: 'nr',
    band: `n${row.band}`,
    aliases: [String(row.band), `N${row.band}`],
    duplex: row.duplex,
    dlMhz,
    ulMhz: tdd ? dlMhz : ulMhz,
    dl: [dlSpan],
    ul: tdd ? [dlSpan] : ulSpan ? [ulSpan] : null,
    // NR ranges nest (n78 ⊂ n77, n38 ⊂ n41): prefer the narrowest band.
    rank: dlSpan.last - dlSpan.first,
    provenance: row.provenance,
    getDlMhz: getNrArfcnFrequencyMhz,
    getUlMhz: getNrArfcnFrequencyMhz,
    getDlChannel: getNrArfcnExact,
    getUlChannel: getNrArfcnExact,
    getUlFromDl: (n) => {
      if (tdd) return n;
      if (!ulSpan) return null;
      const ulChannel = Math.round(getNrArfcnExact(getNrArfcnFrequencyMhz(n) - duplexGapMhz));
      return ulChannel >= ulSpan.first && ulChannel <= ulSpan.last ? ulChannel : null;
    },
    getDlFromUl: (n) => (tdd ? n : Math.round(getNrArfcnExact(getNrArfcnFrequencyMhz(n) + duplexGapMhz))),
    isOnChannelRaster: (n, isDl) =>
      (isDl && (row.extra ?? []).includes(n)) ||
      (isDl || tdd ? row.dl : (row.ul ?? [])).some((r) => n >= r.first && n <= r.last && (n - r.first) % r.step === 0),
  };
}

// ---------------------------------------------------------------------------------------------------------
// UMTS — 3GPP TS 25.101 §5.4.4, Table 5.1: N = 5·(F − F_Offset); bands I and VIII have no
// additional (100 kHz-offset) channels (Table 5.1A).

interface UmtsRow {
  band: string;
  number: number;
  offsetMhz: number;
  duplexMhz: number;
  dl: ChannelRange;
  ul: ChannelRange;
  dlMhz: MhzRange;
  ulMhz: MhzRange;
}

const UMTS_ROWS: UmtsRow[] = [
  {
    band: 'I',
    number: 1,
    offsetMhz: 0,
    duplexMhz: 190,
    dl: { first: 10_562, last: 10_838 },
    ul: { first: 9612, last: 9888 },
    dlMhz: { low: 2110, high: 2170 },
    ulMhz: { low: 1920, high: 1980 },
  },
  {
    band: 'VIII',
    number: 8,
    offsetMhz: 340,
    duplexMhz: 45,
    dl: { first: 2937, last: 3088 },
    ul: { first: 2712, last: 2863 },
    dlMhz: { low: 925, high: 960 },
    ulMhz: { low: 880, high: 915 },
  },
];

function createUmtsBand(row: UmtsRow, index: number): BandDef {
  const toMhz = (n: number) => (5 * row.offsetMhz + n) / 5;
  const toChannel = (mhz: number) => 5 * (mhz - row.offsetMhz);
  const pairShift = 5 * row.duplexMhz;
  return {
    tech: 'umts',
    band: row.band,
    aliases: [row.band, String(row.number), `B${row.number}`],
    duplex: 'FDD',
    dlMhz: row.dlMhz,
    ulMhz: row.ulMhz,
    dl: [row.dl],
    ul: [row.ul],
    rank: index,
    provenance: 'published',
    getDlMhz: toMhz,
    getUlMhz: toMhz,
    getDlChannel: toChannel,
    getUlChannel: toChannel,
    getUlFromDl: (n) => n - pairShift,
    getDlFromUl: (n) => n + pairShift,
  };
}

// ---------------------------------------------------------------------------------------------------------
// GSM — 3GPP TS 45.005 §2: one ARFCN names an uplink/downlink pair 200 kHz wide.

interface GsmSegment {
  first: number;
  last: number;
  /** Uplink frequency of ARFCN `first`, MHz. */
  ulFirstMhz: number;
}

interface GsmRow {
  band: string;
  aliases: string[];
  segments: GsmSegment[];
  duplexMhz: number;
  ulMhz: MhzRange;
  provenance: Provenance;
}

const PCS_CAUTION = 'ARFCN 512–810 is also PCS 1900 (uplink 1850.2 + 0.2·(n − 512) MHz); DCS 1800 is assumed unless the band is given';

// Row order is the preference when ARFCN ranges overlap: P-GSM before E-GSM, DCS 1800 before PCS 1900.
const GSM_ROWS: GsmRow[] = [
  {
    band: 'P-GSM900',
    aliases: ['PGSM900', 'PGSM', 'GSM900', '900'],
    segments: [{ first: 1, last: 124, ulFirstMhz: 890.2 }],
    duplexMhz: 45,
    ulMhz: { low: 890, high: 915 },
    provenance: 'published',
  },
  {
    band: 'E-GSM900',
    aliases: ['EGSM900', 'EGSM'],
    segments: [
      { first: 0, last: 124, ulFirstMhz: 890 },
      { first: 975, last: 1023, ulFirstMhz: 880.2 },
    ],
    duplexMhz: 45,
    ulMhz: { low: 880, high: 915 },
    provenance: 'published',
  },
  {
    band: 'DCS1800',
    aliases: ['DCS', '1800', 'GSM1800'],
    segments: [{ first: 512, last: 885, ulFirstMhz: 1710.2 }],
    duplexMhz: 95,
    ulMhz: { low: 1710, high: 1785 },
    provenance: 'published',
  },
  {
    band: 'PCS1900',
    aliases: ['PCS', '1900', 'GSM1900'],
    segments: [{ first: 512, last: 810, ulFirstMhz: 1850.2 }],
    duplexMhz: 80,
    ulMhz: { low: 1850, high: 1910 },
    provenance: 'published',
  },
  {
    band: 'GSM850',
    aliases: ['850'],
    segments: [{ first: 128, last: 251, ulFirstMhz: 824.2 }],
    duplexMhz: 45,
    ulMhz: { low: 824, high: 849 },
    provenance: 'from memory, verify',
  },
];

function createGsmBand(row: GsmRow, index: number): BandDef {
  const segmentOf = (n: number) => row.segments.find((s) => n >= s.first && n <= s.last) ?? row.segments[0]!;
  const getUlMhz = (n: number) => {
    const s = segmentOf(n);
    return (Math.round(s.ulFirstMhz * 10) + 2 * (n - s.first)) / 10;
  };
  const getUlChannel = (mhz: number) => {
    for (const s of row.segments) {
      const n = s.first + 5 * (mhz - s.ulFirstMhz);
      if (Math.round(n) >= s.first && Math.round(n) <= s.last) return n;
    }
    return Number.NaN;
  };
  const ranges = row.segments.map(({ first, last }) => ({ first, last }));
  return {
    tech: 'gsm',
    band: row.band,
    aliases: [row.band, ...row.aliases],
    duplex: 'FDD',
    dlMhz: { low: row.ulMhz.low + row.duplexMhz, high: row.ulMhz.high + row.duplexMhz },
    ulMhz: row.ulMhz,
    dl: ranges,
    ul: ranges,
    rank: index,
    provenance: row.provenance,
    getDlMhz: (n) => roundMhz(getUlMhz(n) + row.duplexMhz),
    getUlMhz,
    getDlChannel: (mhz) => getUlChannel(mhz - row.duplexMhz),
    getUlChannel,
    getUlFromDl: (n) => n,
    getDlFromUl: (n) => n,
  };
}

const BANDS: Record<RadioTech, BandDef[]> = {
  lte: LTE_ROWS.map(createLteBand),
  nr: NR_ROWS.map(createNrBand),
  umts: UMTS_ROWS.map(createUmtsBand),
  gsm: GSM_ROWS.map(createGsmBand),
};

// ---------------------------------------------------------------------------------------------------------

function assertChannelNumber(tech: RadioTech, channel: number): void {
  if (!Number.isInteger(channel) || channel < 0) {
    throw new ChannelError('INVALID_CHANNEL', `${CHANNEL_NAME[tech]} must be a whole number ≥ 0, got ${channel}`);
  }
}

function noGlobalRaster(arfcn: number): ChannelError {
  return new ChannelError('NO_BAND', `NR-ARFCN ${arfcn} is outside the NR global frequency raster (0–${NR_ARFCN_MAX})`);
}

function findBandDef(tech: RadioTech, band: string): BandDef | undefined {
  const wanted = normaliseLabel(band);
  return BANDS[tech].find((def) => normaliseLabel(def.band) === wanted || def.aliases.some((a) => normaliseLabel(a) === wanted));
}

function toSummary(def: BandDef): BandSummary {
  return {
    tech: def.tech,
    band: def.band,
    duplex: def.duplex,
    dlMhz: def.dlMhz,
    ulMhz: def.ulMhz,
    dlChannels: def.dl,
    ulChannels: def.ul,
    provenance: def.provenance,
  };
}

interface Match {
  def: BandDef;
  direction: LinkDirection;
}

/** For a channel number GSM names the pair (`both`); for a frequency the link is known. */
function directionOf(def: BandDef, isDl: boolean, ofChannelNumber: boolean): LinkDirection {
  if (def.duplex === 'TDD' || (ofChannelNumber && def.tech === 'gsm')) return 'both';
  return isDl ? 'DL' : 'UL';
}

function listMatches(tech: RadioTech, channel: number): Match[] {
  const matches: Match[] = [];
  for (const def of BANDS[tech]) {
    if (isIn(def.dl, channel)) matches.push({ def, direction: directionOf(def, true, true) });
    else if (isIn(def.ul, channel)) matches.push({ def, direction: directionOf(def, false, true) });
  }
  // Phones and modems report downlink channels, so a downlink reading wins; then (NR) a band whose channel
  // raster holds the number; then a row read from the standard over a regional row from memory (e.g. n78
  // over the US-only n48); then the band's own rank.
  const isUl = (m: Match) => Number(m.direction === 'UL');
  const offRaster = (m: Match) => Number(m.def.isOnChannelRaster ? !m.def.isOnChannelRaster(channel, m.direction !== 'UL') : false);
  const unverified = (m: Match) => Number(m.def.provenance !== 'published');
  return matches.sort((a, b) => isUl(a) - isUl(b) || offRaster(a) - offRaster(b) || unverified(a) - unverified(b) || a.def.rank - b.def.rank);
}

/** The bands known for a technology, with their edges and channel ranges. */
export function listBands(tech: RadioTech): BandSummary[] {
  return BANDS[tech].map(toSummary);
}

/** One band by label ('B20', '20', 'n78', 'VIII', 'DCS1800' …); throws ChannelError when unknown. */
export function getBand(tech: RadioTech, band: string): BandSummary {
  const def = findBandDef(tech, band);
  if (!def) throw new ChannelError('UNKNOWN_BAND', `Unknown ${TECH_NAME[tech]} band '${band}'`);
  return toSummary(def);
}

export function isKnownBand(tech: RadioTech, band: string): boolean {
  return findBandDef(tech, band) !== undefined;
}

/** Whether a channel number (downlink or uplink) lies in the band; false for unknown bands. */
export function isChannelInBand(tech: RadioTech, channel: number, band: string): boolean {
  const def = findBandDef(tech, band);
  if (!def || !Number.isInteger(channel) || channel < 0) return false;
  return isIn(def.dl, channel) || isIn(def.ul, channel);
}

/**
 * Band, frequencies and pairing of a channel number. A number in several bands resolves to the most
 * likely one (downlink reading, on the channel raster, published row, narrowest NR band; DCS over PCS for
 * GSM) and lists the others in `alternativeBands`; `options.band` picks one explicitly.
 */
export function lookupChannel(tech: RadioTech, channel: number, options: { band?: string } = {}): ChannelInfo {
  assertChannelNumber(tech, channel);
  if (tech === 'nr' && channel > NR_ARFCN_MAX) throw noGlobalRaster(channel);
  const matches = listMatches(tech, channel);
  let chosen: Match | undefined = matches[0];
  if (options.band !== undefined) {
    const def = findBandDef(tech, options.band);
    if (!def) throw new ChannelError('UNKNOWN_BAND', `Unknown ${TECH_NAME[tech]} band '${options.band}'`);
    chosen = matches.find((m) => m.def === def);
    if (!chosen) {
      throw new ChannelError('NOT_IN_BAND', `${CHANNEL_NAME[tech]} ${channel} is not in ${TECH_NAME[tech]} band ${def.band}`);
    }
  }
  if (!chosen) throw new ChannelError('NO_BAND', `${CHANNEL_NAME[tech]} ${channel} is in no known ${TECH_NAME[tech]} band`);
  return describeChannel(tech, channel, chosen, matches);
}

function describeChannel(tech: RadioTech, channel: number, chosen: Match, matches: Match[]): ChannelInfo {
  const { def, direction } = chosen;
  const dlChannel = direction === 'UL' ? def.getDlFromUl(channel) : channel;
  const ulChannel = direction === 'UL' ? channel : def.getUlFromDl(channel);
  const notes: string[] = [];
  if (def.band === 'DCS1800' && channel <= 810) notes.push(PCS_CAUTION);
  if (def.isOnChannelRaster && direction !== 'UL' && !def.isOnChannelRaster(channel, true)) {
    notes.push(
      `${CHANNEL_NAME[tech]} ${channel} is not on band ${def.band}'s channel raster; it is probably an SSB position (absoluteFrequencySSB), not the carrier centre`,
    );
  }
  if (def.provenance !== 'published') notes.push(`Band ${def.band} table row is from memory, verify`);
  return {
    tech,
    channel,
    band: def.band,
    duplex: def.duplex,
    direction,
    dlChannel,
    dlMhz: roundMhz(def.getDlMhz(dlChannel)),
    ulChannel: def.duplex === 'SDL' ? null : ulChannel,
    ulMhz: def.duplex === 'SDL' || ulChannel === null ? null : roundMhz(def.getUlMhz(ulChannel)),
    alternativeBands: matches.filter((m) => m.def !== def).map((m) => m.def.band),
    notes,
  };
}

/**
 * Every (band, channel, link) whose raster holds a frequency — a frequency alone does not name the band
 * (2650 MHz is B7 downlink and B41; TS 36.101 Table 5.7.3-1). Off-raster frequencies give the nearest channel with
 * `exact: false`.
 */
export function findChannelsForFrequency(tech: RadioTech, freqMhz: number): FrequencyCandidate[] {
  if (!Number.isFinite(freqMhz) || freqMhz <= 0) return [];
  const candidates: FrequencyCandidate[] = [];
  const push = (def: BandDef, exactChannel: number, ranges: ChannelRange[] | null, isDl: boolean) => {
    if (!Number.isFinite(exactChannel)) return;
    // `+ 0` turns the −0 that rounding a tiny negative gives into 0.
    const channel = Math.round(exactChannel) + 0;
    if (!isIn(ranges, channel)) return;
    const exact = Math.abs(channel - exactChannel) < 1e-6;
    candidates.push({ tech, band: def.band, channel, direction: directionOf(def, isDl, false), exact });
  };
  if (tech === 'nr' && freqMhz > 100_000) return [];
  for (const def of BANDS[tech]) {
    push(def, def.getDlChannel(freqMhz), def.dl, true);
    if (def.duplex === 'FDD') push(def, def.getUlChannel(freqMhz), def.ul, false);
  }
  return candidates.sort((a, b) => Number(a.direction === 'UL') - Number(b.direction === 'UL'));
}
