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

const PUB: Provenance = 'published';
const MEM: Provenance = 'from memory, verify';
type Triple = [number, number, number];
type Pair = [number, number];

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
// Columns: band, duplex, downlink [F_DL_low MHz, N_Offs-DL, last N_DL], uplink [F_UL_low MHz, N_Offs-UL, last N_UL] or null.
const LTE_ROWS: LteRow[] = (
  [
    [1, 'FDD', [2110, 0, 599], [1920, 18000, 18599], PUB],
    [2, 'FDD', [1930, 600, 1199], [1850, 18600, 19199], MEM],
    [3, 'FDD', [1805, 1200, 1949], [1710, 19200, 19949], PUB],
    [4, 'FDD', [2110, 1950, 2399], [1710, 19950, 20399], MEM],
    [5, 'FDD', [869, 2400, 2649], [824, 20400, 20649], MEM],
    [7, 'FDD', [2620, 2750, 3449], [2500, 20750, 21449], PUB],
    [8, 'FDD', [925, 3450, 3799], [880, 21450, 21799], PUB],
    [12, 'FDD', [729, 5010, 5179], [699, 23010, 23179], MEM],
    [13, 'FDD', [746, 5180, 5279], [777, 23180, 23279], MEM],
    [14, 'FDD', [758, 5280, 5379], [788, 23280, 23379], MEM],
    [17, 'FDD', [734, 5730, 5849], [704, 23730, 23849], MEM],
    [19, 'FDD', [875, 6000, 6149], [830, 24000, 24149], PUB],
    // Band 20 is "reverse" duplex: the uplink lies above the downlink.
    [20, 'FDD', [791, 6150, 6449], [832, 24150, 24449], PUB],
    [25, 'FDD', [1930, 8040, 8689], [1850, 26040, 26689], MEM],
    [26, 'FDD', [859, 8690, 9039], [814, 26690, 27039], MEM],
    [28, 'FDD', [758, 9210, 9659], [703, 27210, 27659], PUB],
    [29, 'SDL', [717, 9660, 9769], null, MEM],
    [32, 'SDL', [1452, 9920, 10359], null, PUB],
    [38, 'TDD', [2570, 37750, 38249], null, PUB],
    [39, 'TDD', [1880, 38250, 38649], null, MEM],
    [40, 'TDD', [2300, 38650, 39649], null, PUB],
    [41, 'TDD', [2496, 39650, 41589], null, PUB],
    [42, 'TDD', [3400, 41590, 43589], null, PUB],
    [43, 'TDD', [3600, 43590, 45589], null, PUB],
    [48, 'TDD', [3550, 55240, 56739], null, MEM],
    // Bands ≥ 65 use the extended EARFCN range (above 65535). Band 66's downlink is 20 MHz wider than its
    // uplink; the top downlink channels have no paired uplink.
    [66, 'FDD', [2110, 66436, 67335], [1710, 131972, 132671], MEM],
    [71, 'FDD', [617, 68586, 68935], [663, 133122, 133471], MEM],
  ] satisfies [number, Duplex, Triple, Triple | null, Provenance][]
).map(([band, duplex, [fDlLow, nOffsDl, nDlLast], ul, provenance]) => ({
  band,
  duplex,
  fDlLow,
  nOffsDl,
  nDlLast,
  ul: ul ? { fUlLow: ul[0], nOffsUl: ul[1], nUlLast: ul[2] } : undefined,
  provenance,
}));

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

const raster = (first: number, step: number, last: number): NrRaster => ({ first, step, last });
const step20 = (first: number, last: number): NrRaster[] => [raster(first, 20, last)];

// Published rows: 3GPP TS 38.104 (Tables 5.2-1 and 5.4.2.3-1/-2, as quoted by an open-source gNB).
// Memory rows: FR1 ranges also match that implementation; FR2 n257/n260/n261 convert to their band edges.
// Columns: band, duplex, downlink edges [low, high] MHz, uplink edges or null, downlink rasters, uplink rasters or null,
// provenance, extra allowed downlink values (n28's 40 MHz carrier).
const NR_ROWS: NrRow[] = (
  [
    [1, 'FDD', [2110, 2170], [1920, 1980], step20(422_000, 434_000), step20(384_000, 396_000), PUB],
    [2, 'FDD', [1930, 1990], [1850, 1910], step20(386_000, 398_000), step20(370_000, 382_000), MEM],
    [3, 'FDD', [1805, 1880], [1710, 1785], step20(361_000, 376_000), step20(342_000, 357_000), PUB],
    [5, 'FDD', [869, 894], [824, 849], step20(173_800, 178_800), step20(164_800, 169_800), MEM],
    [7, 'FDD', [2620, 2690], [2500, 2570], step20(524_000, 538_000), step20(500_000, 514_000), PUB],
    [8, 'FDD', [925, 960], [880, 915], step20(185_000, 192_000), step20(176_000, 183_000), PUB],
    [12, 'FDD', [729, 746], [699, 716], step20(145_800, 149_200), step20(139_800, 143_200), MEM],
    [20, 'FDD', [791, 821], [832, 862], step20(158_200, 164_200), step20(166_400, 172_400), PUB],
    [25, 'FDD', [1930, 1995], [1850, 1915], step20(386_000, 399_000), step20(370_000, 383_000), MEM],
    [28, 'FDD', [758, 803], [703, 748], step20(151_600, 160_600), step20(140_600, 149_600), PUB, [155_608]],
    [38, 'TDD', [2570, 2620], null, step20(514_000, 524_000), null, PUB],
    [40, 'TDD', [2300, 2400], null, step20(460_000, 480_000), null, PUB],
    [41, 'TDD', [2496, 2690], null, [raster(499_200, 3, 537_999), raster(499_200, 6, 537_996)], null, PUB],
    [48, 'TDD', [3550, 3700], null, [raster(636_667, 1, 646_666)], null, MEM],
    [66, 'FDD', [2110, 2200], [1710, 1780], step20(422_000, 440_000), step20(342_000, 356_000), MEM],
    [71, 'FDD', [617, 652], [663, 698], step20(123_400, 130_400), step20(132_600, 139_600), MEM],
    [77, 'TDD', [3300, 4200], null, [raster(620_000, 1, 680_000)], null, PUB],
    [78, 'TDD', [3300, 3800], null, [raster(620_000, 1, 653_333)], null, PUB],
    [79, 'TDD', [4400, 5000], null, [raster(693_334, 1, 733_333)], null, MEM],
    [257, 'TDD', [26500, 29500], null, [raster(2_054_166, 1, 2_104_165)], null, MEM],
    [258, 'TDD', [24250, 27500], null, [raster(2_016_667, 1, 2_070_832)], null, PUB],
    [260, 'TDD', [37000, 40000], null, [raster(2_229_166, 1, 2_279_165)], null, MEM],
    [261, 'TDD', [27500, 28350], null, [raster(2_070_833, 1, 2_084_999)], null, MEM],
  ] satisfies [number, Duplex, Pair, Pair | null, NrRaster[], NrRaster[] | null, Provenance, number[]?][]
).map(([band, duplex, [dlLow, dlHigh], ulEdges, dl, ul, provenance, extra]) => ({
  band,
  duplex,
  dlMhz: { low: dlLow, high: dlHigh },
  ulMhz: ulEdges ? { low: ulEdges[0], high: ulEdges[1] } : undefined,
  dl,
  ul: ul ?? undefined,
  extra,
  provenance,
}));

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

// Columns: band, number, F_Offset MHz, duplex spacing MHz, downlink and uplink UARFCN [first, last], downlink and
// uplink band edges [low, high] MHz.
const UMTS_ROWS: UmtsRow[] = (
  [
    ['I', 1, 0, 190, [10_562, 10_838], [9612, 9888], [2110, 2170], [1920, 1980]],
    ['VIII', 8, 340, 45, [2937, 3088], [2712, 2863], [925, 960], [880, 915]],
  ] satisfies [string, number, number, number, Pair, Pair, Pair, Pair][]
).map(([band, number, offsetMhz, duplexMhz, dl, ul, dlMhz, ulMhz]) => ({
  band,
  number,
  offsetMhz,
  duplexMhz,
  dl: { first: dl[0], last: dl[1] },
  ul: { first: ul[0], last: ul[1] },
  dlMhz: { low: dlMhz[0], high: dlMhz[1] },
  ulMhz: { low: ulMhz[0], high: ulMhz[1] },
}));

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
const segment = (first: number, last: number, ulFirstMhz: number): GsmSegment => ({ first, last, ulFirstMhz });

// Columns: band, other accepted labels, ARFCN segments, duplex spacing MHz, uplink band edges [low, high] MHz.
const GSM_ROWS: GsmRow[] = (
  [
    ['P-GSM900', ['PGSM900', 'PGSM', 'GSM900', '900'], [segment(1, 124, 890.2)], 45, [890, 915], PUB],
    ['E-GSM900', ['EGSM900', 'EGSM'], [segment(0, 124, 890), segment(975, 1023, 880.2)], 45, [880, 915], PUB],
    ['DCS1800', ['DCS', '1800', 'GSM1800'], [segment(512, 885, 1710.2)], 95, [1710, 1785], PUB],
    ['PCS1900', ['PCS', '1900', 'GSM1900'], [segment(512, 810, 1850.2)], 80, [1850, 1910], PUB],
    ['GSM850', ['850'], [segment(128, 251, 824.2)], 45, [824, 849], MEM],
  ] satisfies [string, string[], GsmSegment[], number, Pair, Provenance][]
).map(([band, aliases, segments, duplexMhz, [low, high], provenance]) => ({ band, aliases, segments, duplexMhz, ulMhz: { low, high }, provenance }));

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
