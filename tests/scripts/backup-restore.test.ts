// Backup and restore round trip against the test database, and the guard that keeps the seed and
// reset scripts from wiping real data.
import { afterAll, beforeEach, describe, expect, it } from 'vitest';
import { createHash } from 'node:crypto';
import { existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { createBackup, restoreBackup, verifyBackup, FILES_FOLDER } from '../../scripts/lib/backup';
import { assertOnlyDemoData, findNonDemoData } from '../../scripts/lib/demo-guard';
import { testDb, truncateAll } from '../helpers/db';
import { makeUser } from '../helpers/factories';

const url = () => process.env.DATABASE_URL!;
const work = mkdtempSync(join(tmpdir(), 'bearline-backup-test-'));
afterAll(() => rmSync(work, { recursive: true, force: true }));

function write(path: string, content: string | Uint8Array) {
  mkdirSync(join(path, '..'), { recursive: true });
  writeFileSync(path, content);
}

describe('backup and restore', () => {
  let dataDir: string;
  let backupRoot: string;
  beforeEach(async () => {
    await truncateAll();
    const run = mkdtempSync(join(work, 'run-'));
    dataDir = join(run, 'data');
    backupRoot = join(run, 'backups');
    write(join(dataDir, 'elevation', 'a1b2.f32'), new Uint8Array([1, 2, 3, 4, 5, 6, 7, 8]));
    write(join(dataDir, 'uploads', 'photos', 'p1.jpg'), 'jpeg bytes');
    write(join(dataDir, 'pg', 'PG_VERSION'), '15'); // the cluster: never part of a backup
    write(join(dataDir, 'elevation', '.c3d4.f32.1.2.part'), 'half written');
  });

  it('writes the dump and the data files with a manifest of checksums, leaving out the cluster', async () => {
    const { dir, manifest } = await createBackup({ databaseUrl: url(), dataDir, backupRoot, now: new Date('2026-12-02T04:05:06Z') });
    expect(dir).toBe(join(backupRoot, 'bearline-20261202T040506Z'));
    expect(manifest.files.map((f) => f.path)).toEqual(['elevation/a1b2.f32', 'uploads/photos/p1.jpg']);
    const photo = manifest.files[1];
    expect(photo.sha256).toBe(createHash('sha256').update('jpeg bytes').digest('hex'));
    expect(readFileSync(join(dir, FILES_FOLDER, 'uploads/photos/p1.jpg'), 'utf8')).toBe('jpeg bytes');
    expect(manifest.database.bytes).toBeGreaterThan(1000);
    expect(manifest.database.latest_migration).toMatch(/^\d{14}_/);
    expect(verifyBackup(dir)).toEqual(manifest);
  });

  it('brings back the rows and files as they were, removing what came after', async () => {
    const db = testDb();
    const user = await makeUser('planner', { email: 'ines.marlow@example.test' });
    const [customer] = await db('customers')
      .insert({ name: 'Ines Marlow', address_label: 'Sedge Cottage', geom: db.raw('ST_SetSRID(ST_MakePoint(-128.5, -47.2), 4326)') })
      .returning('id');
    const { dir } = await createBackup({ databaseUrl: url(), dataDir, backupRoot });

    await db('customers').where({ id: customer.id }).update({ name: 'Changed after the backup' });
    await db('users').where({ id: user.id }).delete();
    await makeUser('admin', { email: 'later@example.test' });
    rmSync(join(dataDir, 'uploads'), { recursive: true });
    write(join(dataDir, 'elevation', 'a1b2.f32'), 'overwritten');
    write(join(dataDir, 'elevation', 'stray.f32'), 'came later');

    await restoreBackup({ dir, databaseUrl: url(), dataDir, backupRoot });
    expect((await db('customers').where({ id: customer.id }).first()).name).toBe('Ines Marlow');
    expect(await db('users').orderBy('id').pluck('email')).toEqual(['ines.marlow@example.test']);
    // Geometry survives (PostGIS types come back as they were).
    const pos = await db('customers').where({ id: customer.id }).first(db.raw('ST_X(geom) AS lon'));
    expect(pos.lon).toBe(-128.5);
    expect(readFileSync(join(dataDir, 'uploads', 'photos', 'p1.jpg'), 'utf8')).toBe('jpeg bytes');
    expect([...readFileSync(join(dataDir, 'elevation', 'a1b2.f32'))]).toEqual([1, 2, 3, 4, 5, 6, 7, 8]);
    expect(existsSync(join(dataDir, 'elevation', 'stray.f32'))).toBe(false);
    expect(readFileSync(join(dataDir, 'pg', 'PG_VERSION'), 'utf8')).toBe('15');
    // Sequences come back too: the next row does not collide with restored ids.
    expect(Number((await makeUser('surveyor')).id)).toBeGreaterThan(Number(user.id));
  });

  it('refuses a damaged backup before changing anything', async () => {
    const db = testDb();
    const { dir } = await createBackup({ databaseUrl: url(), dataDir, backupRoot });
    await makeUser('planner', { email: 'kept@example.test' });
    writeFileSync(join(dir, FILES_FOLDER, 'uploads/photos/p1.jpg'), 'tampered');
    await expect(restoreBackup({ dir, databaseUrl: url(), dataDir, backupRoot })).rejects.toThrow(/damaged[\s\S]*p1\.jpg: checksum does not match/);
    rmSync(join(dir, 'database.dump'));
    expect(() => verifyBackup(dir)).toThrow(/database\.dump: missing/);
    expect(await db('users').pluck('email')).toEqual(['kept@example.test']);
    expect(() => verifyBackup(join(work, 'nowhere'))).toThrow(/not a Bearline backup/);
  });
});

describe('demo-data guard of the seed and reset scripts', () => {
  beforeEach(truncateAll);

  it('lets an empty database be seeded', async () => {
    expect(await findNonDemoData(url())).toEqual([]);
  });

  it('lets the demo scenario alone be wiped', async () => {
    await makeUser('planner', { email: 'planner@demo.bearline.test' });
    await testDb()('demo_scenario').insert({ id: 1, loaded_at: new Date(Date.now() + 60_000) });
    expect(await findNonDemoData(url())).toEqual([]);
    await expect(assertOnlyDemoData(url(), 'Seeding', false)).resolves.toBeUndefined();
  });

  it('refuses a database with accounts that are not demo accounts, unless forced', async () => {
    await makeUser('planner', { email: 'planner@demo.bearline.test' });
    await makeUser('admin', { email: 'real.admin@example.test' });
    await testDb()('demo_scenario').insert({ id: 1, loaded_at: new Date(Date.now() + 60_000) });
    const reasons = await findNonDemoData(url());
    expect(reasons.join()).toContain('real.admin@example.test');
    await expect(assertOnlyDemoData(url(), 'Seeding', false)).rejects.toThrow(/would wipe[\s\S]*--force/);
    await expect(assertOnlyDemoData(url(), 'Seeding', true)).resolves.toBeUndefined();
  });

  it('refuses data the demo seeds did not load, and changes made after they did', async () => {
    const db = testDb();
    await db('customers').insert({ name: 'Real person', address_label: 'Real farm', geom: db.raw('ST_SetSRID(ST_MakePoint(0, 0), 4326)') });
    expect((await findNonDemoData(url())).join()).toMatch(/no demo scenario marker/);
    await db('demo_scenario').insert({ id: 1, loaded_at: new Date('2026-01-01T00:00:00Z') });
    await db('audit_log').insert({ action: 'update', entity: 'customer', entity_id: '1' });
    expect((await findNonDemoData(url())).join()).toMatch(/1 change\(s\) recorded since the demo scenario was loaded/);
  });
});
