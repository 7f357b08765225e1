// A local S3-compatible server (s3rver) for the tests, so the S3 storage runs against real HTTP.
import { mkdirSync } from 'node:fs';
import { createRequire } from 'node:module';

const require = createRequire(import.meta.url);

export const FAKE_S3_BUCKET = 'bearline-test';
// s3rver's fixed credentials.
export const FAKE_S3_ACCESS_KEY = 'S3RVER';
export const FAKE_S3_SECRET_KEY = 'S3RVER';

export interface FakeS3 {
  endpoint: string;
  close(): Promise<void>;
}

export async function startFakeS3(opts: { port: number; dir: string }): Promise<FakeS3> {
  mkdirSync(opts.dir, { recursive: true });
  const S3rver = require('s3rver') as new (options: Record<string, unknown>) => { run(): Promise<{ port: number }>; close(): Promise<void> };
  const server = new S3rver({
    address: '127.0.0.1',
    port: opts.port,
    directory: opts.dir,
    silent: true,
    configureBuckets: [{ name: FAKE_S3_BUCKET }],
  });
  const address = await server.run();
  return { endpoint: `http://127.0.0.1:${address.port}`, close: () => server.close() };
}
