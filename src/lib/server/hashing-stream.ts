// Passes a byte stream through while counting it and computing its SHA-256 (for the audit trail).
import { createHash } from 'node:crypto';
import { PassThrough, type Readable } from 'node:stream';

export function hashingStream(input: Readable): { stream: Readable; sha256: () => string; bytes: () => number } {
  const hash = createHash('sha256');
  let bytes = 0;
  const out = new PassThrough({
    transform(chunk: Buffer, _enc, done) {
      hash.update(chunk);
      bytes += chunk.byteLength;
      done(null, chunk);
    },
  });
  input.on('error', (err) => out.destroy(err));
  input.pipe(out);
  let digest: string | null = null;
  return { stream: out, sha256: () => (digest ??= hash.digest('hex')), bytes: () => bytes };
}
