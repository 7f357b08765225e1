// Writes brotli (.br) and gzip (.gz) twins of the build's text assets at the highest levels, once per
// build, so the server sends them without compressing on each request (server/serve.mjs).
import { readdirSync, readFileSync, statSync, writeFileSync } from 'node:fs';
import { extname, join } from 'node:path';
import { brotliCompressSync, constants, gzipSync } from 'node:zlib';

const TEXT = new Set(['.js', '.mjs', '.css', '.html', '.svg', '.json', '.txt', '.xml', '.webmanifest']);
/** Files smaller than this are sent as they are (one packet either way). */
const MIN_BYTES = 1024;

export function precompressDir(dir: string): { files: number; bytes: number; brBytes: number } {
  const totals = { files: 0, bytes: 0, brBytes: 0 };
  const walk = (d: string) => {
    for (const name of readdirSync(d)) {
      const p = join(d, name);
      if (statSync(p).isDirectory()) {
        walk(p);
        continue;
      }
      if (!TEXT.has(extname(name))) continue;
      const body = readFileSync(p);
      if (body.length < MIN_BYTES) continue;
      const br = brotliCompressSync(body, { params: { [constants.BROTLI_PARAM_QUALITY]: 11, [constants.BROTLI_PARAM_SIZE_HINT]: body.length } });
      const gz = gzipSync(body, { level: 9 });
      if (br.length < body.length) writeFileSync(`${p}.br`, br);
      if (gz.length < body.length) writeFileSync(`${p}.gz`, gz);
      totals.files += 1;
      totals.bytes += body.length;
      totals.brBytes += Math.min(br.length, body.length);
    }
  };
  walk(dir);
  return totals;
}
