import { describe, it, expect } from 'vitest';
import {
  ChannelError,
  findChannelsForFrequency,
  getBand,
  getGscnFrequencyMhz,
  getNrArfcnForFrequency,
  getNrArfcnFrequencyMhz,
  isChannelInBand,
  isKnownBand,
  listBands,
  lookupChannel,
  type RadioTech,
} from '../../src/lib/domain/channels';

function expectChannelError(fn: () => unknown, code: string, message: RegExp): void {
  try {
    fn();
  } catch (error) {
    expect(error).toBeInstanceOf(ChannelError);
    expect((error as ChannelError).code).toBe(code);
    expect((error as ChannelError).message).toMatch(message);
    return;
  }
  throw new Error('expected a ChannelError');
}

describe('LTE EARFCN', () => {
  // 3GPP TS 36.101 Table 5.7.3-1, calculated check values, ±0.001 MHz
  it.each([
    { earfcn: 6300, band: 'B20', dl: 806.0, ulEarfcn: 24300, ul: 847.0, duplex: 'FDD' },
    { earfcn: 6150, band: 'B20', dl: 791.0, ulEarfcn: 24150, ul: 832.0, duplex: 'FDD' },
    { earfcn: 6149, band: 'B19', dl: 889.9, ulEarfcn: 24149, ul: 844.9, duplex: 'FDD' },
    { earfcn: 1300, band: 'B3', dl: 1815.0, ulEarfcn: 19300, ul: 1720.0, duplex: 'FDD' },
    { earfcn: 100, band: 'B1', dl: 2120.0, ulEarfcn: 18100, ul: 1930.0, duplex: 'FDD' },
    { earfcn: 3050, band: 'B7', dl: 2650.0, ulEarfcn: 21050, ul: 2530.0, duplex: 'FDD' },
    { earfcn: 3725, band: 'B8', dl: 952.5, ulEarfcn: 21725, ul: 907.5, duplex: 'FDD' },
    { earfcn: 9410, band: 'B28', dl: 778.0, ulEarfcn: 27410, ul: 723.0, duplex: 'FDD' },
    { earfcn: 10000, band: 'B32', dl: 1460.0, ulEarfcn: null, ul: null, duplex: 'SDL' },
    { earfcn: 38000, band: 'B38', dl: 2595.0, ulEarfcn: 38000, ul: 2595.0, duplex: 'TDD' },
    { earfcn: 39150, band: 'B40', dl: 2350.0, ulEarfcn: 39150, ul: 2350.0, duplex: 'TDD' },
    { earfcn: 40620, band: 'B41', dl: 2593.0, ulEarfcn: 40620, ul: 2593.0, duplex: 'TDD' },
    { earfcn: 42590, band: 'B42', dl: 3500.0, ulEarfcn: 42590, ul: 3500.0, duplex: 'TDD' },
    { earfcn: 44590, band: 'B43', dl: 3700.0, ulEarfcn: 44590, ul: 3700.0, duplex: 'TDD' },
  ])('EARFCN $earfcn → $band, DL $dl MHz, UL $ul MHz', ({ earfcn, band, dl, ulEarfcn, ul, duplex }) => {
    const info = lookupChannel('lte', earfcn);
    expect(info.band).toBe(band);
    expect(info.duplex).toBe(duplex);
    expect(info.direction).toBe(duplex === 'TDD' ? 'both' : 'DL');
    expect(info.dlChannel).toBe(earfcn);
    expect(info.dlMhz).toBeCloseTo(dl, 3);
    expect(info.ulChannel).toBe(ulEarfcn);
    if (ul === null) expect(info.ulMhz).toBeNull();
    else expect(info.ulMhz).toBeCloseTo(ul, 3);
    expect(info.alternativeBands).toEqual([]);
  });

  // TS 36.101 Table 5.7.3-1: N_UL = N_DL + 18000 for these FDD rows, so an uplink EARFCN maps back to its downlink
  it.each([
    [24300, 'B20', 6300, 806.0, 847.0],
    [19300, 'B3', 1300, 1815.0, 1720.0],
    [21725, 'B8', 3725, 952.5, 907.5],
  ])('uplink EARFCN %s → %s, paired DL %s', (earfcn, band, dlChannel, dl, ul) => {
    const info = lookupChannel('lte', earfcn);
    expect(info).toMatchObject({ band, direction: 'UL', dlChannel, ulChannel: earfcn });
    expect(info.dlMhz).toBeCloseTo(dl, 3);
    expect(info.ulMhz).toBeCloseTo(ul, 3);
  });

  // TS 36.101 §5.7.3 inverse: N_DL = 10·(806 − 791) + 6150 = 6300; 2650 MHz is both B7 DL and B41; 2595 MHz B38 and B41
  it.each([
    [806, [{ band: 'B20', channel: 6300, direction: 'DL', exact: true }]],
    // 847 MHz is also the uplink of bands 5 and 26 (rows from memory, TS 36.101)
    [
      847,
      [
        { band: 'B5', channel: 20630, direction: 'UL', exact: true },
        { band: 'B20', channel: 24300, direction: 'UL', exact: true },
        { band: 'B26', channel: 27020, direction: 'UL', exact: true },
      ],
    ],
    [
      2650,
      [
        { band: 'B7', channel: 3050, direction: 'DL', exact: true },
        { band: 'B41', channel: 41190, direction: 'both', exact: true },
      ],
    ],
    [
      2595,
      [
        { band: 'B38', channel: 38000, direction: 'both', exact: true },
        { band: 'B41', channel: 40640, direction: 'both', exact: true },
      ],
    ],
  ])('%s MHz → candidates %j', (mhz, expected) => {
    const candidates = findChannelsForFrequency('lte', mhz);
    expect(candidates.map(({ band, channel, direction, exact }) => ({ band, channel, direction, exact }))).toEqual(expected);
  });

  it('gives the nearest channel, flagged inexact, for an off-raster frequency', () => {
    const [candidate] = findChannelsForFrequency('lte', 806.04);
    expect(candidate).toMatchObject({ band: 'B20', channel: 6300, exact: false });
  });

  // TS 36.101 Table 5.7.3-1: EARFCN ranges are disjoint; numbers between the rows belong to no band
  it.each([70000, 10360, 65535, 262144])('EARFCN %s is in no known band', (earfcn) => {
    expectChannelError(() => lookupChannel('lte', earfcn), 'NO_BAND', new RegExp(`^EARFCN ${earfcn} is in no known LTE band$`));
  });

  it.each([12.5, -1, Number.NaN])('rejects %s as an EARFCN', (earfcn) => {
    expectChannelError(() => lookupChannel('lte', earfcn), 'INVALID_CHANNEL', /EARFCN must be a whole number/);
  });

  it('marks bands not read from the standard', () => {
    expect(lookupChannel('lte', 5100).notes.join(' ')).toMatch(/from memory, verify/); // band 12
    expect(lookupChannel('lte', 6300).notes).toEqual([]);
  });

  // from memory (TS 36.101): band 66's downlink is wider than its uplink, so its top channels are unpaired
  it('leaves the upper band 66 downlink channels without an uplink', () => {
    expect(lookupChannel('lte', 66436)).toMatchObject({ band: 'B66', dlMhz: 2110, ulChannel: 131972, ulMhz: 1710 });
    expect(lookupChannel('lte', 67335)).toMatchObject({ band: 'B66', ulChannel: null, ulMhz: null });
  });
});

describe('band tables', () => {
  // every band of TS 36.101 Table 5.7.3-1, TS 38.104 Table 5.2-1, TS 25.101 Table 5.1 and TS 45.005 §2 that we read is known
  it.each([
    ['lte', ['B1', 'B3', 'B7', 'B8', 'B19', 'B20', 'B28', 'B32', 'B38', 'B40', 'B41', 'B42', 'B43']],
    ['nr', ['n1', 'n3', 'n7', 'n8', 'n20', 'n28', 'n38', 'n40', 'n41', 'n77', 'n78', 'n258']],
    ['umts', ['I', 'VIII']],
    ['gsm', ['P-GSM900', 'E-GSM900', 'DCS1800', 'PCS1900']],
  ] as const)('%s covers the published bands', (tech, bands) => {
    const known = listBands(tech).map((b) => b.band);
    for (const band of bands) expect(known).toContain(band);
    for (const band of bands) expect(getBand(tech, band).provenance).toBe('published');
  });

  // TS 36.101 Table 5.7.3-1: the LTE EARFCN ranges (DL and UL) never overlap
  it('keeps LTE channel ranges disjoint', () => {
    const ranges = listBands('lte')
      .flatMap((b) => [...b.dlChannels, ...(b.duplex === 'FDD' ? (b.ulChannels ?? []) : [])])
      .sort((a, b) => a.first - b.first);
    for (let i = 1; i < ranges.length; i++) expect(ranges[i]!.first).toBeGreaterThan(ranges[i - 1]!.last);
  });

  // band edges, TS 36.101 Table 5.5-1 and TS 38.104 Table 5.2-1 (DL / UL MHz)
  it.each([
    ['lte', 'B20', 791, 821, 832, 862],
    ['lte', 'B28', 758, 803, 703, 748],
    ['lte', 'B41', 2496, 2690, 2496, 2690],
    ['nr', 'n20', 791, 821, 832, 862],
    ['nr', 'n41', 2496, 2690, 2496, 2690],
    ['nr', 'n258', 24250, 27500, 24250, 27500],
    ['umts', 'I', 2110, 2170, 1920, 1980],
    ['gsm', 'DCS1800', 1805, 1880, 1710, 1785],
  ] as const)('%s %s spans DL %s–%s, UL %s–%s MHz', (tech, band, dlLow, dlHigh, ulLow, ulHigh) => {
    const summary = getBand(tech, band);
    expect(summary.dlMhz).toEqual({ low: dlLow, high: dlHigh });
    expect(summary.ulMhz).toEqual({ low: ulLow, high: ulHigh });
  });

  // TS 36.101 Table 5.7.3-1 (N range rows): first and last channel of every LTE band resolve to that band
  it.each(listBands('lte').map((b) => [b.band, b] as const))('LTE %s: first and last channels are in the band', (band, summary) => {
    for (const range of [...summary.dlChannels, ...(summary.ulChannels ?? [])]) {
      expect(lookupChannel('lte', range.first).band).toBe(band);
      expect(lookupChannel('lte', range.last).band).toBe(band);
    }
    const first = lookupChannel('lte', summary.dlChannels[0]!.first);
    const last = lookupChannel('lte', summary.dlChannels[0]!.last);
    expect(first.dlMhz).toBeCloseTo(summary.dlMhz.low, 6);
    expect(last.dlMhz).toBeCloseTo(summary.dlMhz.high - 0.1, 6);
  });

  it('throws a ChannelError for an unknown band label', () => {
    expectChannelError(() => getBand('lte', 'B99'), 'UNKNOWN_BAND', /Unknown LTE band 'B99'/);
    expect(isKnownBand('lte', 'B99')).toBe(false);
    expect(isKnownBand('nr', '78')).toBe(true);
  });
});

describe('5G NR-ARFCN', () => {
  // 3GPP TS 38.104 Table 5.4.2.1-1 global raster, calculated check values, ±0.001 MHz
  it.each([
    [158200, 791.0, 'n20'],
    [151600, 758.0, 'n28'],
    [160600, 803.0, 'n28'],
    [155608, 778.04, 'n28'],
    [428000, 2140.0, 'n1'],
    [368500, 1842.5, 'n3'],
    [537999, 2689.995, 'n41'],
    [632628, 3489.42, 'n78'],
    [641280, 3619.2, 'n78'],
    [653333, 3799.995, 'n78'],
    [680000, 4200.0, 'n77'],
    [2016667, 24250.08, 'n258'],
    [2050000, 26250.06, 'n258'],
    [2070832, 27499.98, 'n258'],
  ])('NR-ARFCN %s → %s MHz in %s', (arfcn, mhz, band) => {
    expect(getNrArfcnFrequencyMhz(arfcn)).toBeCloseTo(mhz, 3);
    const info = lookupChannel('nr', arfcn);
    // 791–803 MHz lies in both n20 and n28 DL, so n28's edges may resolve to n20 with n28 as alternative
    expect([info.band, ...info.alternativeBands]).toContain(band);
    expect(isChannelInBand('nr', arfcn, band)).toBe(true);
    expect(info.dlMhz).toBeCloseTo(mhz, 3);
    expect(getNrArfcnForFrequency(mhz)).toBe(arfcn);
  });

  // TS 38.104 Table 5.4.2.1-1: range switch between the 5 kHz and 15 kHz rasters
  it.each([
    [599999, 2999.995],
    [600000, 3000.0],
    [0, 0],
    [3279165, 99999.96],
  ])('NR-ARFCN %s → %s MHz at the raster range edges', (arfcn, mhz) => {
    expect(getNrArfcnFrequencyMhz(arfcn)).toBeCloseTo(mhz, 3);
  });

  // TS 38.104 Table 5.4.2.3-1: overlapping ranges resolve to a band whose raster holds the number, published
  // rows before rows from memory, then the narrowest
  it.each([
    [641280, 'n78', ['n77', 'n48']],
    [680000, 'n77', []],
    [519000, 'n38', ['n41']],
    [530000, 'n7', ['n41']],
    [537999, 'n41', ['n7']],
    [428000, 'n1', ['n66']],
    [160600, 'n20', ['n28']],
    [2070832, 'n258', ['n257']],
  ])('NR-ARFCN %s resolves to %s, alternatives %j', (arfcn, band, alternatives) => {
    const info = lookupChannel('nr', arfcn);
    expect(info.band).toBe(band);
    expect(info.alternativeBands).toEqual(alternatives);
  });

  it('lets the caller choose among overlapping bands', () => {
    expect(lookupChannel('nr', 641280, { band: 'n77' }).band).toBe('n77');
    expectChannelError(() => lookupChannel('nr', 680000, { band: 'n78' }), 'NOT_IN_BAND', /NR-ARFCN 680000 is not in NR band n78/);
  });

  // TS 38.104 Table 5.2-1: FDD pairs (n20 UL 832–862 above DL; n1 duplex 190 MHz)
  it.each([
    [158200, 166400, 832.0],
    [428000, 390000, 1950.0],
    [155608, 144608, 723.04],
  ])('NR-ARFCN %s pairs with uplink %s (%s MHz)', (arfcn, ulArfcn, ulMhz) => {
    const info = lookupChannel('nr', arfcn);
    expect(info.ulChannel).toBe(ulArfcn);
    expect(info.ulMhz).toBeCloseTo(ulMhz, 3);
  });

  it('maps an uplink NR-ARFCN back to its downlink', () => {
    expect(lookupChannel('nr', 166400)).toMatchObject({ band: 'n20', direction: 'UL', dlChannel: 158200 });
  });

  // from memory, verify: phones often report the SSB position, which need not sit on the channel raster
  it('notes an NR-ARFCN off the channel raster as a likely SSB position', () => {
    const info = lookupChannel('nr', 422410); // 2112.05 MHz = GSCN 5279
    expect(info.band).toBe('n1');
    expect(info.notes.join(' ')).toMatch(/SSB/);
    expect(lookupChannel('nr', 428000).notes).toEqual([]);
    expect(lookupChannel('nr', 155608).notes).toEqual([]); // n28's listed 40 MHz value
  });

  // GSCN check values (TS 38.104 Table 5.4.3.1-1)
  it.each([
    [7711, 3305.28],
    [8051, 3794.88],
    [1982, 793.25],
    [5279, 2112.05],
    [22256, 24250.08],
  ])('GSCN %s → SSB at %s MHz', (gscn, mhz) => {
    expect(getGscnFrequencyMhz(gscn)).toBeCloseTo(mhz, 3);
  });

  it.each([1, 26640, 7711.5])('rejects GSCN %s', (gscn) => {
    expect(() => getGscnFrequencyMhz(gscn)).toThrow(ChannelError);
  });

  it('lists NR bands for a frequency (2650 MHz: n7 DL and n41)', () => {
    const bands = findChannelsForFrequency('nr', 2650).map((c) => `${c.band}:${c.channel}:${c.direction}`);
    expect(bands).toEqual(['n7:530000:DL', 'n41:530000:both']);
  });

  it('rejects numbers outside the global raster and numbers in no band', () => {
    expectChannelError(() => lookupChannel('nr', 3279166), 'NO_BAND', /outside the NR global frequency raster/);
    expectChannelError(() => lookupChannel('nr', 100000), 'NO_BAND', /^NR-ARFCN 100000 is in no known NR band$/);
    expect(findChannelsForFrequency('nr', 200_000)).toEqual([]);
  });
});

describe('UMTS UARFCN', () => {
  // 3GPP TS 25.101 Table 5.1, calculated check values, ±0.01 MHz
  it.each([
    [10562, 'I', 'DL', 2112.4],
    [10700, 'I', 'DL', 2140.0],
    [10838, 'I', 'DL', 2167.6],
    [9612, 'I', 'UL', 1922.4],
    [2937, 'VIII', 'DL', 927.4],
    [3011, 'VIII', 'DL', 942.2],
    [3088, 'VIII', 'DL', 957.6],
    [2712, 'VIII', 'UL', 882.4],
    [2787, 'VIII', 'UL', 897.4],
  ])('UARFCN %s → band %s %s %s MHz', (uarfcn, band, direction, mhz) => {
    const info = lookupChannel('umts', uarfcn);
    expect(info.band).toBe(band);
    expect(info.direction).toBe(direction);
    expect(direction === 'DL' ? info.dlMhz : info.ulMhz).toBeCloseTo(mhz, 2);
  });

  // TS 25.101 Table 5.1: duplex spacing 190 MHz (band I) and 45 MHz (band VIII)
  it.each([
    [10700, 9750, 1950.0],
    [3011, 2786, 897.2],
  ])('UARFCN %s pairs with uplink %s (%s MHz)', (uarfcn, ul, ulMhz) => {
    const info = lookupChannel('umts', uarfcn);
    expect(info.ulChannel).toBe(ul);
    expect(info.ulMhz).toBeCloseTo(ulMhz, 2);
  });

  it('finds the UARFCN of a frequency', () => {
    expect(findChannelsForFrequency('umts', 2140)).toEqual([{ tech: 'umts', band: 'I', channel: 10700, direction: 'DL', exact: true }]);
  });

  it('reports a UARFCN in no band', () => {
    expectChannelError(() => lookupChannel('umts', 10000), 'NO_BAND', /^UARFCN 10000 is in no known UMTS band$/);
  });
});

describe('GSM ARFCN', () => {
  // 3GPP TS 45.005 §2, calculated check values, ±0.01 MHz
  it.each([
    [1, 'P-GSM900', 890.2, 935.2],
    [62, 'P-GSM900', 902.4, 947.4],
    [124, 'P-GSM900', 914.8, 959.8],
    [0, 'E-GSM900', 890.0, 935.0],
    [975, 'E-GSM900', 880.2, 925.2],
    [1023, 'E-GSM900', 889.8, 934.8],
    [512, 'DCS1800', 1710.2, 1805.2],
    [700, 'DCS1800', 1747.8, 1842.8],
    [885, 'DCS1800', 1784.8, 1879.8],
  ])('ARFCN %s → %s, UL %s / DL %s MHz', (arfcn, band, ul, dl) => {
    const info = lookupChannel('gsm', arfcn);
    expect(info.band).toBe(band);
    expect(info.direction).toBe('both');
    expect(info.ulMhz).toBeCloseTo(ul, 2);
    expect(info.dlMhz).toBeCloseTo(dl, 2);
    expect(info.ulChannel).toBe(arfcn);
  });

  // TS 45.005 §2: ARFCN 512–810 is also PCS 1900; DCS is the default
  it('defaults 512–810 to DCS 1800 with a PCS 1900 caution', () => {
    const info = lookupChannel('gsm', 700);
    expect(info.alternativeBands).toEqual(['PCS1900']);
    expect(info.notes.join(' ')).toMatch(/PCS 1900/);
    expect(lookupChannel('gsm', 885).notes).toEqual([]);
    expect(lookupChannel('gsm', 885).alternativeBands).toEqual([]);
  });

  // TS 45.005 §2: PCS 1900 uplink 1850.2 + 0.2·(n − 512), downlink +80 MHz
  it('uses PCS 1900 when that band is given', () => {
    const info = lookupChannel('gsm', 512, { band: 'PCS1900' });
    expect(info.band).toBe('PCS1900');
    expect(info.ulMhz).toBeCloseTo(1850.2, 2);
    expect(info.dlMhz).toBeCloseTo(1930.2, 2);
  });

  it('finds GSM channels for a downlink frequency', () => {
    const found = findChannelsForFrequency('gsm', 925.2).map((c) => `${c.band}:${c.channel}:${c.direction}`);
    expect(found).toEqual(['E-GSM900:975:DL']);
    const both900 = findChannelsForFrequency('gsm', 935.2).map((c) => `${c.band}:${c.channel}:${c.direction}`);
    expect(both900).toEqual(['P-GSM900:1:DL', 'E-GSM900:1:DL']);
  });

  it.each([900, 1024, 300])('reports ARFCN %s as in no band', (arfcn) => {
    expectChannelError(() => lookupChannel('gsm', arfcn), 'NO_BAND', /^ARFCN \d+ is in no known GSM band$/);
  });
});

describe('isChannelInBand', () => {
  // TS 36.101 / 38.104 / 25.101 / 45.005 channel-number ranges
  it.each([
    ['lte', 6300, 'B20', true],
    ['lte', 6300, '20', true],
    ['lte', 24300, 'b20', true],
    ['lte', 6300, 'band 20', true],
    ['lte', 6300, 'B3', false],
    ['lte', 6149, 'B20', false],
    ['nr', 641280, 'n78', true],
    ['nr', 641280, '77', true],
    ['nr', 680000, 'n78', false],
    ['umts', 10700, 'I', true],
    ['umts', 10700, '1', true],
    ['umts', 10700, 'VIII', false],
    ['gsm', 0, 'P-GSM900', false],
    ['gsm', 0, 'E-GSM900', true],
    ['gsm', 700, 'PCS1900', true],
    ['gsm', 850, 'PCS1900', false],
    ['lte', 6300, 'B999', false],
    ['lte', 6300.5, 'B20', false],
  ] as [RadioTech, number, string, boolean][])('%s channel %s in band %s → %s', (tech, channel, band, expected) => {
    expect(isChannelInBand(tech, channel, band)).toBe(expected);
  });
});

describe('findChannelsForFrequency at a band edge', () => {
  // 3GPP TS 45.005 §2: E-GSM 900 ARFCN 0 is 935.0 MHz downlink. A frequency a rounding error below it
  // still names channel 0, and never −0 (which would not equal 0 under Object.is).
  it('gives channel 0, not −0, just below 935 MHz', () => {
    const hit = findChannelsForFrequency('gsm', 934.9999999999999).find((c) => c.band === 'E-GSM900' && c.direction === 'DL');
    expect(hit).toBeDefined();
    expect(Object.is(hit!.channel, 0)).toBe(true);
  });
});
