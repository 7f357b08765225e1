// Where uploaded files live: one interface, two implementations — a folder on local disk (the
// default, under the data folder) and S3-compatible object storage. Keys are relative paths of
// lower-case letters, digits, '.', '_', '-' and '/'; callers make them content-addressed, so a
// second put of the same key writes the same bytes. Runs outside Vite too (seeds): callers pass
// the settings.
import { mkdir, readFile, rename, rm, stat, writeFile } from 'node:fs/promises';
import { dirname, join, resolve, sep } from 'node:path';
import { randomBytes } from 'node:crypto';
import { DeleteObjectCommand, GetObjectCommand, HeadObjectCommand, NoSuchKey, NotFound, PutObjectCommand, S3Client } from '@aws-sdk/client-s3';

export interface StoredObject {
  bytes: Uint8Array;
  contentType: string;
}

export interface ObjectStorage {
  readonly kind: 'local' | 's3';
  put(key: string, bytes: Uint8Array, contentType: string): Promise<void>;
  /** The object, or null when there is none under the key. */
  get(key: string): Promise<StoredObject | null>;
  exists(key: string): Promise<boolean>;
  delete(key: string): Promise<void>;
}

const KEY_PATTERN = /^[a-z0-9][a-z0-9._-]*(\/[a-z0-9][a-z0-9._-]*)*$/;

export function assertStorageKey(key: string): void {
  if (!KEY_PATTERN.test(key) || key.split('/').some((part) => part === '..' || part === '.') || key.length > 512) {
    throw new Error(`Not a storage key: ${JSON.stringify(key)}`);
  }
}

/** Files under one folder; the content type is kept in a small side file. */
export class LocalDiskStorage implements ObjectStorage {
  readonly kind = 'local' as const;
  private readonly root: string;

  constructor(root: string) {
    this.root = resolve(root);
  }

  private pathOf(key: string): string {
    assertStorageKey(key);
    const path = resolve(join(this.root, key));
    if (!path.startsWith(this.root + sep)) throw new Error(`Not a storage key: ${key}`);
    return path;
  }

  async put(key: string, bytes: Uint8Array, contentType: string): Promise<void> {
    const path = this.pathOf(key);
    await mkdir(dirname(path), { recursive: true });
    // Write beside, then rename: a reader never sees half a file.
    const tmp = `${path}.${randomBytes(6).toString('hex')}.tmp`;
    await writeFile(tmp, bytes);
    await writeFile(`${path}.type`, contentType);
    await rename(tmp, path);
  }

  async get(key: string): Promise<StoredObject | null> {
    const path = this.pathOf(key);
    try {
      const [bytes, type] = await Promise.all([readFile(path), readFile(`${path}.type`, 'utf8').catch(() => 'application/octet-stream')]);
      return { bytes: new Uint8Array(bytes), contentType: type.trim() };
    } catch (err) {
      if ((err as NodeJS.ErrnoException).code === 'ENOENT') return null;
      throw err;
    }
  }

  async exists(key: string): Promise<boolean> {
    try {
      return (await stat(this.pathOf(key))).isFile();
    } catch (err) {
      if ((err as NodeJS.ErrnoException).code === 'ENOENT') return false;
      throw err;
    }
  }

  async delete(key: string): Promise<void> {
    const path = this.pathOf(key);
    await rm(path, { force: true });
    await rm(`${path}.type`, { force: true });
  }
}

export interface S3Settings {
  endpoint: string;
  bucket: string;
  region: string;
  accessKeyId: string;
  secretAccessKey: string;
}

/** An S3-compatible bucket through the AWS SDK (path-style addressing, as most compatible servers need). */
export class S3Storage implements ObjectStorage {
  readonly kind = 's3' as const;
  private readonly client: S3Client;
  private readonly bucket: string;

  constructor(settings: S3Settings) {
    this.bucket = settings.bucket;
    this.client = new S3Client({
      endpoint: settings.endpoint,
      region: settings.region,
      forcePathStyle: true,
      credentials: { accessKeyId: settings.accessKeyId, secretAccessKey: settings.secretAccessKey },
      // Compatible servers do not all know the SDK's newer default checksums.
      requestChecksumCalculation: 'WHEN_REQUIRED',
      responseChecksumValidation: 'WHEN_REQUIRED',
    });
  }

  async put(key: string, bytes: Uint8Array, contentType: string): Promise<void> {
    assertStorageKey(key);
    await this.client.send(new PutObjectCommand({ Bucket: this.bucket, Key: key, Body: bytes, ContentType: contentType, ContentLength: bytes.byteLength }));
  }

  async get(key: string): Promise<StoredObject | null> {
    assertStorageKey(key);
    try {
      const out = await this.client.send(new GetObjectCommand({ Bucket: this.bucket, Key: key }));
      if (!out.Body) return null;
      return { bytes: await out.Body.transformToByteArray(), contentType: out.ContentType ?? 'application/octet-stream' };
    } catch (err) {
      if (isMissing(err)) return null;
      throw err;
    }
  }

  async exists(key: string): Promise<boolean> {
    assertStorageKey(key);
    try {
      await this.client.send(new HeadObjectCommand({ Bucket: this.bucket, Key: key }));
      return true;
    } catch (err) {
      if (isMissing(err)) return false;
      throw err;
    }
  }

  async delete(key: string): Promise<void> {
    assertStorageKey(key);
    await this.client.send(new DeleteObjectCommand({ Bucket: this.bucket, Key: key }));
  }
}

function isMissing(err: unknown): boolean {
  if (err instanceof NoSuchKey || err instanceof NotFound) return true;
  const status = (err as { $metadata?: { httpStatusCode?: number } }).$metadata?.httpStatusCode;
  return status === 404;
}

export interface StorageSettings {
  dataDir: string;
  s3Endpoint?: string;
  s3Bucket?: string;
  s3Region?: string;
  s3AccessKeyId?: string;
  s3SecretAccessKey?: string;
}

/** S3 when its endpoint, bucket and keys are all set; otherwise `<dataDir>/files` on local disk. */
export function createStorage(s: StorageSettings): ObjectStorage {
  if (s.s3Endpoint && s.s3Bucket && s.s3AccessKeyId && s.s3SecretAccessKey) {
    return new S3Storage({
      endpoint: s.s3Endpoint,
      bucket: s.s3Bucket,
      region: s.s3Region || 'us-east-1',
      accessKeyId: s.s3AccessKeyId,
      secretAccessKey: s.s3SecretAccessKey,
    });
  }
  return new LocalDiskStorage(join(s.dataDir, 'files'));
}
