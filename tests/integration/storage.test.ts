import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { randomBytes } from 'node:crypto';
import { LocalDiskStorage, S3Storage, createStorage, type ObjectStorage } from '../../src/lib/server/storage';
import { FAKE_S3_ACCESS_KEY, FAKE_S3_BUCKET, FAKE_S3_SECRET_KEY, startFakeS3, type FakeS3 } from '../../scripts/lib/fake-s3';

// `npm test` starts the fake S3 server and passes S3_TEST_ENDPOINT; a run by hand starts its own.
let ownS3: FakeS3 | null = null;
let s3Endpoint = process.env.S3_TEST_ENDPOINT ?? '';
const localRoot = mkdtempSync(join(tmpdir(), 'bearline-storage-'));

beforeAll(async () => {
  if (!s3Endpoint) {
    ownS3 = await startFakeS3({ port: 0, dir: join(localRoot, 's3') });
    s3Endpoint = ownS3.endpoint;
  }
});

afterAll(async () => {
  await ownS3?.close();
  rmSync(localRoot, { recursive: true, force: true });
});

const s3Settings = () => ({
  endpoint: s3Endpoint,
  bucket: FAKE_S3_BUCKET,
  region: 'us-east-1',
  accessKeyId: FAKE_S3_ACCESS_KEY,
  secretAccessKey: FAKE_S3_SECRET_KEY,
});

const implementations: Array<[string, () => ObjectStorage]> = [
  ['local disk', () => new LocalDiskStorage(join(localRoot, 'files'))],
  ['S3', () => new S3Storage(s3Settings())],
];

describe.each(implementations)('%s storage', (_name, make) => {
  const run = randomBytes(4).toString('hex');

  it('keeps bytes and content type, tells what exists, and deletes', async () => {
    const storage = make();
    const key = `photos/original/${run}-a.jpg`;
    const bytes = new Uint8Array(randomBytes(70_000));
    expect(await storage.exists(key)).toBe(false);
    expect(await storage.get(key)).toBeNull();
    await storage.put(key, bytes, 'image/jpeg');
    expect(await storage.exists(key)).toBe(true);
    const got = await storage.get(key);
    expect(got?.contentType).toBe('image/jpeg');
    expect(Buffer.from(got!.bytes).equals(Buffer.from(bytes))).toBe(true);
    await storage.delete(key);
    expect(await storage.exists(key)).toBe(false);
    expect(await storage.get(key)).toBeNull();
  });

  it('replaces an object put again under the same key', async () => {
    const storage = make();
    const key = `photos/thumb/${run}-b.webp`;
    await storage.put(key, new Uint8Array([1, 2, 3]), 'image/webp');
    await storage.put(key, new Uint8Array([4, 5]), 'image/webp');
    expect([...(await storage.get(key))!.bytes]).toEqual([4, 5]);
  });

  it.each(['../escape.jpg', 'photos/../../x', '/abs/path', 'Upper/case', 'a//b', ''])('refuses the key %j', async (key) => {
    await expect(make().put(key, new Uint8Array([1]), 'image/jpeg')).rejects.toThrow(/Not a storage key/);
  });
});

describe('choosing the storage', () => {
  it('uses S3 only when endpoint, bucket and both keys are set', () => {
    expect(createStorage({ dataDir: localRoot }).kind).toBe('local');
    expect(createStorage({ dataDir: localRoot, s3Endpoint: s3Endpoint, s3Bucket: 'b', s3AccessKeyId: 'k' }).kind).toBe('local');
    expect(createStorage({ dataDir: localRoot, s3Endpoint: s3Endpoint, s3Bucket: 'b', s3AccessKeyId: 'k', s3SecretAccessKey: 's' }).kind).toBe('s3');
  });
});
