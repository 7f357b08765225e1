import { beforeAll, describe, expect, it } from 'vitest';
import { GET as channel } from '../../src/pages/api/tools/channel';
import { call } from '../helpers/endpoint';
import { truncateAll } from '../helpers/db';
import { makeUser, asSessionUser } from '../helpers/factories';
import type { SessionUser } from '../../src/lib/server/session-user';

let user: SessionUser;
beforeAll(async () => {
  await truncateAll();
  user = asSessionUser(await makeUser('contributor'));
});

const ask = (qs: string, u: SessionUser | null = user) => call(channel, { url: `/api/tools/channel?${qs}`, user: u });

describe('GET /api/tools/channel', () => {
  it('answers 401 when signed out', async () => {
    expect((await ask('tech=lte&channel=6300', null)).status).toBe(401);
  });

  // 3GPP TS 36.101 Table 5.7.3-1 check values
  it.each([
    ['lte', 6300, 'B20', 806.0, 847.0, 'FDD'],
    ['lte', 1300, 'B3', 1815.0, 1720.0, 'FDD'],
    ['lte', 3050, 'B7', 2650.0, 2530.0, 'FDD'],
    ['lte', 10000, 'B32', 1460.0, null, 'SDL'],
    ['lte', 42590, 'B42', 3500.0, 3500.0, 'TDD'],
  ])('%s %i → band %s, DL %f MHz', async (tech, ch, band, dl, ul, duplex) => {
    const res = await ask(`tech=${tech}&channel=${ch}`);
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ tech, channel: ch, band, duplex });
    expect(res.body.dl_mhz).toBeCloseTo(dl, 3);
    if (ul === null) expect(res.body.ul_mhz).toBeNull();
    else expect(res.body.ul_mhz).toBeCloseTo(ul, 3);
  });

  // 3GPP TS 38.104 §5.4.2.1 global raster check values
  it('converts NR-ARFCN 641280 to 3619.200 MHz in n78', async () => {
    const res = await ask('tech=nr&channel=641280');
    expect(res.body.dl_mhz).toBeCloseTo(3619.2, 3);
    expect(['n78', 'n77']).toContain(res.body.band);
  });

  // 3GPP TS 36.101 Table 5.7.3-1: 806.0 MHz in B20 ↔ EARFCN 6300; 2650 MHz is both B7 DL and B41
  it('lists candidate channels for a frequency and flags ambiguity', async () => {
    const one = await ask('tech=lte&freq_mhz=806');
    expect(one.status).toBe(200);
    expect(one.body.items).toContainEqual(expect.objectContaining({ band: 'B20', channel: 6300, direction: 'DL' }));
    const two = await ask('tech=lte&freq_mhz=2650');
    expect(two.body.ambiguous).toBe(true);
    expect(two.body.items.map((i: { band: string }) => i.band)).toEqual(expect.arrayContaining(['B7', 'B41']));
  });

  it.each([
    ['tech=lte&channel=-1', 'channel'],
    ['tech=lte&channel=abc', 'channel'],
    ['tech=lte&channel=70000', 'channel'],
    ['tech=lte&freq_mhz=0', 'freq_mhz'],
    ['tech=wifi&channel=6', 'tech'],
    ['tech=lte', 'channel'],
    ['tech=lte&channel=6300&freq_mhz=806', 'freq_mhz'],
    ['tech=lte&freq_mhz=5000', 'freq_mhz'],
    ['tech=lte&channel=6300&band=99', 'band'],
  ])('answers 400 with fields for %s', async (qs, field) => {
    const res = await ask(qs);
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('BAD_REQUEST');
    expect(res.body.error.fields[field]?.[0]).toEqual(expect.any(String));
  });
});
