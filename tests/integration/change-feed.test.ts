import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Knex } from 'knex';
import { lucia } from '../../src/lib/server/auth';
import { getChangeFeed, startChangeFeed } from '../../src/lib/server/change-feed';
import { getDataVersion } from '../../src/lib/server/data-version';
import { validateSessionCached } from '../../src/lib/server/session-cache';
import { noteLocalWrite } from '../../src/lib/server/write-epoch';
import { createMast } from '../../src/lib/server/repos/masts';
import { MastInputSchema } from '../../src/lib/schemas/masts';
import { testDb, truncateAll } from '../helpers/db';
import { makeUser } from '../helpers/factories';

/** A stand-in for the database that fails the test if it is asked anything. */
const noDatabase = (() => {
  throw new Error('the database was asked');
}) as unknown as Knex;

async function until(what: string, check: () => boolean | Promise<boolean>): Promise<void> {
  const deadline = Date.now() + 5_000;
  while (!(await check())) {
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 10));
  }
}

const storedVersion = async (kind: string) => String((await testDb()('data_versions').where({ name: kind }).first('version'))?.version ?? 0);

beforeAll(async () => {
  await truncateAll();
  startChangeFeed(process.env.DATABASE_URL);
  await until('the change feed to listen', () => getChangeFeed()?.isLive === true);
});

afterAll(async () => {
  await getChangeFeed()?.stop();
});

describe('data versions from the change feed', () => {
  it('are known without a round trip once read, and follow writes made anywhere', async () => {
    const db = testDb();
    const first = await getDataVersion(db, 'masts');
    expect(first).toBe(await storedVersion('masts'));
    // Read once at this write marker: now from memory.
    expect(await getDataVersion(noDatabase, 'masts')).toBe(first);

    // A write by another connection (another server, psql) arrives as a notification.
    await createMast(db, MastInputSchema.parse({ name: 'Feed Test', lat: -47.2, lon: -128.5 }), null);
    const raised = await storedVersion('masts');
    expect(BigInt(raised)).toBeGreaterThan(BigInt(first));
    await until('the raised version to arrive', async () => (await getDataVersion(noDatabase, 'masts')) === raised);
  });

  it('are read from the database again after a write on this machine, before any notification', async () => {
    const db = testDb();
    await getDataVersion(db, 'basemap');
    // Raised without a notification, so only the local write marker can tell.
    await db.raw("UPDATE data_versions SET version = nextval('data_versions_seq') WHERE name = 'basemap'");
    const raised = await storedVersion('basemap');
    expect(await getDataVersion(noDatabase, 'basemap')).not.toBe(raised);
    noteLocalWrite();
    expect(await getDataVersion(db, 'basemap')).toBe(raised);
  });
});

describe('the session cache', () => {
  it('answers from memory, and drops the session after a local write or a change elsewhere', async () => {
    const db = testDb();
    const user = await makeUser('surveyor');
    const session = await lucia.createSession(user.id, {});
    expect((await validateSessionCached(session.id)).user?.role).toBe('surveyor');

    // Deleted behind the cache's back (no notification): still answered from memory.
    await db.raw('ALTER TABLE sessions DISABLE TRIGGER sessions_notify_changed');
    try {
      await db('sessions').where({ id: session.id }).delete();
    } finally {
      await db.raw('ALTER TABLE sessions ENABLE TRIGGER sessions_notify_changed');
    }
    expect((await validateSessionCached(session.id)).user?.id).toBe(user.id);
    // A sign-out on this machine is a write: the next check asks the database.
    noteLocalWrite();
    expect((await validateSessionCached(session.id)).session).toBeNull();

    // A role change made elsewhere arrives as a notification.
    const other = await lucia.createSession(user.id, {});
    expect((await validateSessionCached(other.id)).user?.role).toBe('surveyor');
    await db('users').where({ id: user.id }).update({ role: 'planner' });
    await until('the role change to arrive', async () => (await validateSessionCached(other.id)).user?.role === 'planner');
  });
});
