import { beforeAll, describe, expect, it } from 'vitest';
import { GET as geocodeRoute } from '../../src/pages/api/geocode/index';
import { ROLES } from '../../src/lib/domain/roles';
import { createGazetteerGeocoder, geocode, type Geocoder } from '../../src/lib/server/geocoder';
import { importAddresses } from '../../src/lib/server/repos/addresses';
import { call } from '../helpers/endpoint';
import { testDb, truncateAll } from '../helpers/db';
import { asSessionUser, makeUser } from '../helpers/factories';
import type { SessionUser } from '../../src/lib/server/session-user';

const ADDRESSES = [
  { label: 'Mill Farm, Crake Lane, Kelvarrow', postcode: 'KV3 2PL', lat: -47.21, lon: -128.52 },
  { label: 'Millbrook Cottage, Fell Road, Tarnavel', postcode: 'TV1 4QA', lat: -47.1, lon: -128.4 },
  { label: 'Low Mill, Quarren Lane, Quarrendale', postcode: 'QD2 7XB', lat: -47.3, lon: -128.45 },
  { label: '4 Harbour Row, Port Tessary', postcode: 'PT1 1AB', lat: -47.35, lon: -128.7 },
  { label: 'Thornfield Farm, Drum Lane, Drumhallow', postcode: 'DH4 9RW', lat: -47.4, lon: -128.6 },
  { label: 'Greythorn House, Tessary Road, Greythorn Cross', postcode: 'GRY-9004', lat: -47.25, lon: -128.55 },
];

let planner: SessionUser;

describe('geocode API', () => {
  beforeAll(async () => {
    await truncateAll();
    planner = asSessionUser(await makeUser('planner'));
    await testDb().transaction((trx) => importAddresses(trx, ADDRESSES, { fileName: null, sha256: 'x', bytes: 0 }, null));
  });

  const search = (q: string, extra = '') => call(geocodeRoute, { user: planner, url: `/api/geocode?q=${encodeURIComponent(q)}${extra}` });

  it('answers 401 when signed out', async () => {
    const res = await call(geocodeRoute, { url: '/api/geocode?q=mill' });
    expect(res.status).toBe(401);
  });

  it.each(ROLES)('serves a %s', async (role) => {
    const user = asSessionUser(await makeUser(role));
    const res = await call(geocodeRoute, { user, url: '/api/geocode?q=mill' });
    expect(res.status).toBe(200);
  });

  it('rejects a missing or too short query and a bad limit with 400', async () => {
    expect((await call(geocodeRoute, { user: planner, url: '/api/geocode' })).body.error.fields.q).toEqual(['Type an address, postcode or coordinates']);
    expect((await search('m')).body.error.fields.q).toEqual(['Type at least 2 characters']);
    expect((await search('mill', '&limit=500')).body.error.fields.limit).toEqual(['limit must be between 1 and 50']);
  });

  it('ranks the closest label first, with the response shape the planner uses', async () => {
    const res = await search('mill farm');
    expect(res.status).toBe(200);
    expect(res.body.items[0]).toEqual({
      label: 'Mill Farm, Crake Lane, Kelvarrow',
      postcode: 'KV3 2PL',
      lat: -47.21,
      lon: -128.52,
      score: expect.any(Number),
      kind: 'address',
    });
    expect(res.body.total).toBe(res.body.items.length);
    const scores = res.body.items.map((i: { score: number }) => i.score);
    expect(scores).toEqual([...scores].sort((a, b) => b - a));
    expect(scores[0]).toBeGreaterThan(0.8);
  });

  it('finds a word inside a long label and ignores unrelated ones', async () => {
    const res = await search('harbour row');
    expect(res.body.items.map((i: { label: string }) => i.label)).toEqual(['4 Harbour Row, Port Tessary']);
  });

  it('finds the words typed so far, the last one unfinished, before any near miss', async () => {
    const res = await search('mill fa', '&limit=1');
    expect(res.body.items.map((i: { label: string }) => i.label)).toEqual(['Mill Farm, Crake Lane, Kelvarrow']);
    // Words in the middle of a label count as well as its first.
    expect((await search('drum lan')).body.items[0].label).toBe('Thornfield Farm, Drum Lane, Drumhallow');
  });

  it('forgives a typo', async () => {
    const res = await search('thornfeild farm');
    expect(res.body.items[0].label).toBe('Thornfield Farm, Drum Lane, Drumhallow');
  });

  it('matches a postcode with or without its space, scoring it 1', async () => {
    for (const q of ['qd2 7xb', 'QD27XB']) {
      const res = await search(q);
      expect(res.body.items[0]).toMatchObject({ label: 'Low Mill, Quarren Lane, Quarrendale', score: 1 });
    }
  });

  it('matches a postcode of the demo format typed with a space or none', async () => {
    for (const q of ['GRY-9004', 'gry 9004', 'gry9004']) {
      const res = await search(q);
      expect(res.body.items[0]).toMatchObject({ label: 'Greythorn House, Tessary Road, Greythorn Cross', score: 1 });
    }
  });

  it('honours the limit and answers an empty list for nonsense', async () => {
    expect((await search('mill', '&limit=1')).body.items).toHaveLength(1);
    expect((await search('zzqxv')).body).toEqual({ items: [], total: 0 });
  });

  it('returns typed decimal coordinates as the first match, then the nearest addresses', async () => {
    const res = await search('-47.2105, -128.5203');
    expect(res.body.items[0]).toEqual({ label: '-47.2105, -128.5203', postcode: null, lat: -47.2105, lon: -128.5203, score: 1, kind: 'coordinates' });
    expect(res.body.items[1]).toMatchObject({ label: 'Mill Farm, Crake Lane, Kelvarrow', kind: 'address' });
    expect(res.body.items[1].score).toBeLessThan(1);
    expect(res.body.total).toBe(2);
  });

  it('answers 400 for coordinates out of range instead of searching addresses for them', async () => {
    const res = await search('95, 10');
    expect(res.status).toBe(400);
    expect(res.body.error.fields.q[0]).toMatch(/Latitude 95 is outside/);
  });

  it('reads decimal commas', async () => {
    const res = await search('-47,2105 -128,5203');
    expect(res.status).toBe(200);
    expect(res.body.items[0]).toMatchObject({ lat: -47.2105, lon: -128.5203, kind: 'coordinates' });
  });

  it('accepts degrees-minutes-seconds with hemisphere letters', async () => {
    const res = await search(`52°12'19.1"N 0°7'18.5"W`);
    expect(res.body.items).toHaveLength(1);
    expect(res.body.items[0]).toMatchObject({ label: '52.2053, -0.1218', kind: 'coordinates', score: 1 });
    expect(res.body.items[0].lat).toBeCloseTo(52.2053056, 6);
    expect(res.body.items[0].lon).toBeCloseTo(-0.1218056, 6);
  });

  it('works with any geocoder behind the interface', async () => {
    const fake: Geocoder = { search: async (q) => [{ label: `hosted ${q}`, postcode: null, lat: 1, lon: 2, score: 0.5, kind: 'address' }] };
    expect(await geocode(fake, 'somewhere', 5)).toHaveLength(1);
    // Without `nearby`, typed coordinates come back alone.
    expect(await geocode(fake, '1.5, 2.5', 5)).toEqual([{ label: '1.5000, 2.5000', postcode: null, lat: 1.5, lon: 2.5, score: 1, kind: 'coordinates' }]);
    expect((await createGazetteerGeocoder(testDb()).search('greythorn', 3))[0]!.label).toMatch(/^Greythorn House/);
  });

  it('answers a postcode typed in full without looking for near misses, which a partial one still gets', async () => {
    await testDb().transaction((trx) =>
      importAddresses(
        trx,
        [{ label: 'Quarry Cottage, Stone Row, Quarrendale', postcode: 'QD2 7XC', lat: -47.31, lon: -128.46 }],
        { fileName: null, sha256: 'y', bytes: 0 },
        null,
      ),
    );
    // The near miss (one letter off) would take a trigram search over the whole gazetteer.
    expect((await search('qd2 7xb')).body.items.map((i: { label: string }) => i.label)).toEqual(['Low Mill, Quarren Lane, Quarrendale']);
    expect((await search('qd2 7x')).body.items.map((i: { label: string }) => i.label).sort()).toEqual([
      'Low Mill, Quarren Lane, Quarrendale',
      'Quarry Cottage, Stone Row, Quarrendale',
    ]);
  });
});
