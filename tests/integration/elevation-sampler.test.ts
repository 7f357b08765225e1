import { beforeEach, describe, expect, it, vi } from 'vitest';
import { getAreaProfileSampler, selectGridsInBox, warmElevationGrids } from '../../src/lib/server/elevation-service';
import { importElevationFile } from '../../src/lib/server/elevation-import';
import { config } from '../../src/lib/server/config';
import { findWarmupPosition } from '../../src/lib/server/repos/candidates';
import { warmShortlist } from '../../src/lib/server/shortlist-warmup';
import { heightTiff } from '../../src/lib/demo/height-tiff';
import { testDb, truncateAll } from '../helpers/db';

// Invented fixture: a flat 250 m square of ground, 0.1° a side, nodes every 0.002°.
function flatTiff(west: number, north: number, heightM: number): Uint8Array {
  return heightTiff({ west, north, step: 0.002, width: 51, height: 51 }, () => heightM);
}

const importTiff = (name: string, bytes: Uint8Array) => importElevationFile(testDb(), { fileName: name, bytes }, { dataDir: config.dataDir, actorId: null });
const from = { lat: 49.95, lon: 10.02 };
const to = { lat: 49.95, lon: 10.08 };
const BOX = [10, 49.9, 10.1, 50] as const;

describe('selectGridsInBox', () => {
  const grid = { west: 10, south: 49.9, east: 10.1, north: 50 };
  it.each([
    { box: [10.05, 49.95, 10.2, 50.1], meets: true, why: 'overlapping' },
    { box: [10.1, 49.9, 10.2, 50], meets: true, why: 'touching at the east edge (ST_Intersects counts the boundary)' },
    { box: [10.1000001, 49.9, 10.2, 50], meets: false, why: 'just east of it' },
    { box: [9, 48, 11, 51], meets: true, why: 'holding it whole' },
    { box: [10, 50.0001, 10.1, 51], meets: false, why: 'north of it' },
  ] as const)('$why', ({ box, meets }) => {
    // Rectangle intersection with boundaries included, as PostGIS ST_Intersects on envelopes (common practice)
    expect(selectGridsInBox([grid], box)).toEqual(meets ? [grid] : []);
  });
});

describe('the area profile sampler keeps the grid list while the elevation data stands', () => {
  beforeEach(truncateAll);

  it('sees a grid imported after a first profile, and stops seeing it once it is deleted', async () => {
    const before = await (await getAreaProfileSampler(BOX))(from, to);
    expect(before.coverage.fraction).toBe(0);

    await importTiff('flat.tif', flatTiff(10, 50, 250));
    const during = await (await getAreaProfileSampler(BOX))(from, to);
    expect(during.coverage.complete).toBe(true);
    // Bilinear weights sum to 1 up to rounding (textbook definition).
    expect(during.points.every((p) => Math.abs(p.groundM! - 250) < 1e-9)).toBe(true);

    await testDb()('elevation_grids').delete();
    const after = await (await getAreaProfileSampler(BOX))(from, to);
    expect(after.coverage.fraction).toBe(0);
  });

  it('takes the finer of two overlapping grids, the same as before the list was kept in memory', async () => {
    await importTiff('low.tif', flatTiff(10, 50, 100));
    const coarse = await importTiff('coarse.tif', flatTiff(9.9, 50.1, 300));
    // Equal spacing: the first grid by id supplies the heights (a stable sort by spacing, grids in id order).
    const p = await (await getAreaProfileSampler(BOX))(from, to);
    expect(p.points.every((q) => Math.abs(q.groundM! - 100) < 1e-9)).toBe(true);
    expect(p.gridIds).not.toContain(coarse.id);
  });

  it('reads every grid into memory ahead of the first profile', async () => {
    await importTiff('a.tif', flatTiff(10, 50, 100));
    await importTiff('b.tif', flatTiff(20, 50, 100));
    expect(await warmElevationGrids()).toBe(2);
  });
});

describe('the shortlist warm-up', () => {
  beforeEach(truncateAll);

  it('finds no position without masts, and one beside an active mast inside the first grid when there are masts', async () => {
    const db = testDb();
    expect(await findWarmupPosition(db)).toBeNull();
    await importTiff('flat.tif', flatTiff(10, 50, 250));
    const point = (lon: number, lat: number) => db.raw('ST_SetSRID(ST_MakePoint(?, ?), 4326)', [lon, lat]);
    await db('masts').insert([
      { name: 'Outside', geom: point(30, 10), status: 'active' },
      { name: 'Inside but planned', geom: point(10.05, 49.95), status: 'planned' },
      { name: 'Inside', geom: point(10.06, 49.94), status: 'active' },
    ]);
    const at = await findWarmupPosition(db);
    expect(at!.lon).toBeCloseTo(10.06, 9);
    expect(at!.lat).toBeCloseTo(49.95, 9);
  });

  it('runs a shortlist once without complaint', async () => {
    const db = testDb();
    await importTiff('flat.tif', flatTiff(10, 50, 250));
    const [op] = await db('operators').insert({ name: 'Warm op', mcc: '001', mnc: '07', colour: '#336699' }).returning('id');
    const [mast] = await db('masts')
      .insert({ name: 'Warm mast', geom: db.raw('ST_SetSRID(ST_MakePoint(10.05, 49.95), 4326)'), status: 'active' })
      .returning('id');
    await db('cells').insert({ mast_id: mast.id, operator_id: op.id, tech: 'lte', band: 'B20', channel: 6300, dl_mhz: 806, pci: 1, antenna_height_m: 30 });
    await db('antennas').insert({
      name: 'Warm panel',
      kind: 'directional',
      ports: 2,
      horizontal_beamwidth_deg: 40,
      gain_table: JSON.stringify([{ freq_mhz: 800, gain_dbi: 8 }]),
    });
    const errors = vi.spyOn(console, 'error');
    await warmShortlist();
    expect(errors).not.toHaveBeenCalled();
    errors.mockRestore();
  });
});
