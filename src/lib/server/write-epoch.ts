// A marker every app process on this machine sees change when any of them has written: the in-memory
// copies (data versions, validated sessions) check it on each use and read PostgreSQL again after a
// write, so whoever wrote sees the effect on the next request whichever worker answers it — without
// waiting for the change notification to arrive. Workers of one server share a small file
// (BEARLINE_WRITE_EPOCH_FILE, made by server/serve.mjs); a lone process needs only its own counter.
import { openSync, readSync, writeSync } from 'node:fs';
import { randomBytes } from 'node:crypto';

const EPOCH_BYTES = 16;
const buffer = Buffer.alloc(EPOCH_BYTES);
let local = 0;
let fd: number | null | undefined;

function sharedFile(): number | null {
  if (fd !== undefined) return fd;
  const path = process.env.BEARLINE_WRITE_EPOCH_FILE;
  fd = null;
  if (path) {
    try {
      fd = openSync(path, 'r+');
    } catch (err) {
      console.error('[bearline] the shared write marker could not be opened; in-memory copies go by this process alone', err);
    }
  }
  return fd;
}

/** The current marker: a different value after any write on this machine (reading costs one pread). */
export function currentWriteEpoch(): string {
  const f = sharedFile();
  if (f === null) return String(local);
  readSync(f, buffer, 0, EPOCH_BYTES, 0);
  return `${local}:${buffer.toString('hex')}`;
}

/** Called after a request that may have written, before its answer leaves. */
export function noteLocalWrite(): void {
  local += 1;
  const f = sharedFile();
  if (f !== null) writeSync(f, randomBytes(EPOCH_BYTES), 0, EPOCH_BYTES, 0);
}
