import { beforeAll, describe, expect, it } from 'vitest';
import { GET as path } from '../../src/pages/api/tools/path';
import { GET as channel } from '../../src/pages/api/tools/channel';
import { call } from '../helpers/endpoint';
import { truncateAll } from '../helpers/db';
import { makeUser, asSessionUser } from '../helpers/factories';
import type { SessionUser } from '../../src/lib/server/session-user';

let user: SessionUser;
beforeAll(async () => {
  await truncateAll();
  user = asSessionUser(await makeUser('planner'));
});

const ask = (qs: string, u: SessionUser | null = user) => call(path, { url: `/api/tools/path?${qs}`, user: u });

describe('GET /api/tools/path', () => {
  it('answers 401 when signed out', async () => {
    expect((await ask('from=52,-1&to=52.009,-1', null)).status).toBe(401);
  });

  it('gives the figures of a path with units in the names', async () => {
    // WGS84 case G5 (geographiclib-geodesic 2.2.0 Inverse): 21654.523 m, azi1 328.124435°, bearing mast→customer 148.023098°;
    // declination W6 2026-01-01 = +10.12° (WMM2025 via geomagnetism 0.2.0)
    const res = await ask('from=44.53461,-109.05572&to=44.7,-109.2&freq_mhz=806&h1_m=8&h2_m=40&date=2026-01-01');
    expect(res.status).toBe(200);
    const b = res.body;
    expect(Math.abs(b.distance_m - 21654.523) / 21654.523).toBeLessThan(0.006);
    expect(Math.abs(b.bearing_true_deg - 328.124435)).toBeLessThan(0.2);
    expect(Math.abs(b.reverse_bearing_true_deg - 148.023098)).toBeLessThan(0.2);
    expect(b.declination_deg).toBeCloseTo(10.12, 1);
    expect(b.bearing_magnetic_deg).toBeCloseTo(b.bearing_true_deg - b.declination_deg, 2);
    expect(b.declination_date).toBe('2026-01-01');
    expect(b.fspl_db).toBeGreaterThan(117);
    expect(b).toHaveProperty('fresnel_radius_mid_m');
    expect(b).toHaveProperty('earth_bulge_mid_m');
    expect(b).toHaveProperty('radio_horizon_km');
    expect(b).toHaveProperty('elevation_deg');
  });

  it('defaults the date to today and heights to 0', async () => {
    const res = await ask('from=52,-1&to=52.009,-1');
    expect(res.status).toBe(200);
    expect(res.body.declination_date).toBe(new Date().toISOString().slice(0, 10));
    expect(res.body.fspl_db).toBeNull();
    expect(res.body.radio_horizon_km).toBe(0);
  });

  it('words its problems for people, not with parameter names or library phrases', async () => {
    const res = await ask('from=52,-1&to=52.1,-1&h1_m=-3&h2_m=5000');
    expect(res.body.error.fields.h1_m).toEqual(['Customer antenna height cannot be negative']);
    expect(res.body.error.fields.h2_m).toEqual(['Mast antenna height above 1000 m is not an antenna height']);
    const band = await call(channel, { url: `/api/tools/channel?tech=lte&channel=6300&band=${'B'.repeat(12)}`, user });
    expect(band.body.error.fields.band).toEqual(['A band name is at most 10 characters']);
  });

  it.each([
    ['from=91,0&to=52,-1', 'from'],
    ['from=52,abc&to=52,-1', 'from'],
    ['from=52,-1&to=52,-181', 'to'],
    ['to=52,-1', 'from'],
    ['from=52,-1', 'to'],
    ['from=52,-1&to=52.1,-1&freq_mhz=0', 'freq_mhz'],
    ['from=52,-1&to=52.1,-1&h1_m=-3', 'h1_m'],
    ['from=52,-1&to=52.1,-1&h2_m=-0.5', 'h2_m'],
    ['from=52,-1&to=52.1,-1&date=2026-13-45', 'date'],
    ['from=52,-1&to=52.1,-1&date=2040-01-01', 'date'],
    ['from=52,-1&to=52,-1&freq_mhz=806', 'to'],
  ])('answers 400 with fields for %s', async (qs, field) => {
    const res = await ask(qs);
    expect(res.status).toBe(400);
    expect(res.body.error.fields[field]?.[0]).toEqual(expect.any(String));
  });
});
