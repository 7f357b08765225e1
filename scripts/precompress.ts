// npm run build: after `astro build`, precompress the client assets (see scripts/lib/precompress.ts).
import { resolve } from 'node:path';
import { precompressDir } from './lib/precompress';
import { ROOT, log } from './lib/project';

const dir = resolve(ROOT, process.argv[2] ?? 'dist', 'client');
const t = precompressDir(dir);
log(`precompressed ${t.files} assets: ${Math.round(t.bytes / 1024)} KB → ${Math.round(t.brBytes / 1024)} KB brotli`);
