// Samples files no grid refers to (left by a crash between a delete and the file's removal, or by
// an interrupted upload) are swept away; files in use and uploads in progress stay.
import { beforeEach, describe, expect, it } from 'vitest';
import { existsSync, mkdirSync, mkdtempSync, utimesSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { removeOrphanSampleFiles } from '../../src/lib/server/repos/elevation';
import { testDb, truncateAll } from '../helpers/db';

describe('orphaned elevation samples files', () => {
  beforeEach(truncateAll);

  it('removes only the files no grid refers to', async () => {
    const dataDir = mkdtempSync(join(tmpdir(), 'bearline-elev-'));
    const folder = join(dataDir, 'elevation');
    mkdirSync(folder);
    for (const f of ['used.f32', 'orphan.f32', '.fresh.f32.1.1.part', '.stale.f32.1.1.part']) writeFileSync(join(folder, f), 'x');
    const hourAgo = (Date.now() - 2 * 60 * 60 * 1000) / 1000;
    utimesSync(join(folder, '.stale.f32.1.1.part'), hourAgo, hourAgo);
    const db = testDb();
    await db('elevation_grids').insert({
      name: 'used.tif',
      format: 'geotiff',
      sha256: 'a'.repeat(64),
      byte_size: 1,
      width: 2,
      height: 2,
      registration: 'point',
      west: 0,
      south: 0,
      east: 1,
      north: 1,
      sample_type: 'float32',
      samples_file: 'used.f32',
      samples_sha256: 'b'.repeat(64),
      bounds: db.raw('ST_MakeEnvelope(0, 0, 1, 1, 4326)'),
    });
    expect(await removeOrphanSampleFiles(db, dataDir)).toEqual(['.stale.f32.1.1.part', 'orphan.f32']);
    expect(existsSync(join(folder, 'used.f32'))).toBe(true);
    expect(existsSync(join(folder, '.fresh.f32.1.1.part'))).toBe(true);
    expect(existsSync(join(folder, 'orphan.f32'))).toBe(false);
    expect(await removeOrphanSampleFiles(db, join(dataDir, 'missing'))).toEqual([]);
  });
});
