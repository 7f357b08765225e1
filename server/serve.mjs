// Serves the built app (dist/) on HOST:PORT with every core: a Node cluster of WEB_CONCURRENCY
// workers (default: one per core) sharing the port. Sessions, throttling and everything else that
// must be shared live in PostgreSQL, so any worker can answer any request. Each worker sends the
// build's precompressed assets (.br / .gz made at build time) and compresses HTML and JSON on the
// way out (gzip or brotli, whichever the client prefers). Plain JavaScript: runs with `node` alone.
import cluster from 'node:cluster';
import { existsSync, readdirSync, statSync, createReadStream, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import http from 'node:http';
import { availableParallelism, tmpdir } from 'node:os';
import { extname, join, resolve, sep } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import compression from 'compression';
import { parseTrustedProxies, refuseMethod, resolveClientAddress, REFUSED_METHODS } from './forwarded.mjs';

const ROOT = resolve(fileURLToPath(new URL('..', import.meta.url)));
const DIST = resolve(process.env.BEARLINE_DIST ?? join(ROOT, 'dist'));
const CLIENT = join(DIST, 'client');
const HOST = process.env.HOST ?? '127.0.0.1';
const PORT = Number(process.env.PORT ?? 4321);
// X-Forwarded-For is believed only from these proxies; otherwise the socket's peer is the client.
const TRUSTED = parseTrustedProxies(process.env.TRUSTED_PROXIES ?? '');
const WORKERS = Math.max(1, Number(process.env.WEB_CONCURRENCY) || availableParallelism());
/** How long a stopping worker lets open requests finish. */
const DRAIN_MS = 10_000;

const TYPES = {
  '.js': 'text/javascript; charset=utf-8',
  '.mjs': 'text/javascript; charset=utf-8',
  '.css': 'text/css; charset=utf-8',
  '.html': 'text/html; charset=utf-8',
  '.svg': 'image/svg+xml',
  '.json': 'application/json',
  '.txt': 'text/plain; charset=utf-8',
  '.xml': 'application/xml',
  '.webmanifest': 'application/manifest+json',
};

function log(message) {
  console.log(`[bearline] ${message}`);
}

/** Every file under the client folder that has a .br or .gz twin, by URL path. */
function listPrecompressed(dir) {
  const found = new Map();
  const walk = (d) => {
    if (!existsSync(d)) return;
    for (const name of readdirSync(d)) {
      const p = join(d, name);
      if (statSync(p).isDirectory()) walk(p);
      else if (!name.endsWith('.br') && !name.endsWith('.gz') && TYPES[extname(name)]) {
        const br = existsSync(`${p}.br`);
        const gz = existsSync(`${p}.gz`);
        if (br || gz)
          found.set(
            '/' +
              p
                .slice(dir.length + 1)
                .split(sep)
                .join('/'),
            { path: p, br, gz },
          );
      }
    }
  };
  walk(dir);
  return found;
}

function preferredEncoding(accept, file) {
  const enc = String(accept ?? '').toLowerCase();
  const allows = (name) => new RegExp(`(^|,)\\s*${name}\\s*(;\\s*q=(?!0(\\.0*)?\\s*(,|$))[\\d.]+)?\\s*(,|$)`).test(enc);
  if (file.br && allows('br')) return 'br';
  if (file.gz && allows('gzip')) return 'gzip';
  return null;
}

/**
 * Starts the app's own work (job queue, periodic jobs, change feed, shortlist warm-up) as soon as the
 * worker listens, instead of on its first request: Astro loads the middleware module, which sets the
 * hook (src/lib/server/process-start.ts), only when a request needs it. Health checks are answered
 * meanwhile; without the module or hook, the first request starts the work as before.
 */
async function startAppWork() {
  const middleware = join(DIST, 'server', '_astro-internal_middleware.mjs');
  if (!existsSync(middleware)) return;
  await import(pathToFileURL(middleware).href);
  const start = globalThis[Symbol.for('bearline.startProcessWork')];
  if (typeof start === 'function') start();
}

function startWorker() {
  process.env.ASTRO_NODE_AUTOSTART = 'disabled';
  return import(pathToFileURL(join(DIST, 'server', 'entry.mjs')).href).then(({ handler }) => {
    const precompressed = listPrecompressed(CLIENT);
    const compress = compression({
      threshold: 1024,
      // Tiles and anything else already encoded pass through as they are.
      filter: (req, res) => !res.getHeader('Content-Encoding') && compression.filter(req, res),
    });
    const server = http.createServer((req, res) => {
      if (REFUSED_METHODS.has(req.method ?? '')) return refuseMethod(req, res);
      // What Astro reports as the client address (sign-in throttling) is decided here, never by the client.
      req.headers['x-forwarded-for'] = resolveClientAddress(req.socket.remoteAddress, req.headers['x-forwarded-for'], TRUSTED);
      if (req.method === 'GET' || req.method === 'HEAD') {
        const path = (req.url ?? '/').split('?')[0];
        const file = precompressed.get(path);
        const encoding = file && preferredEncoding(req.headers['accept-encoding'], file);
        if (file && encoding) {
          const sent = `${file.path}.${encoding === 'br' ? 'br' : 'gz'}`;
          res.writeHead(200, {
            'Content-Type': TYPES[extname(file.path)],
            'Content-Encoding': encoding,
            'Content-Length': statSync(sent).size,
            Vary: 'Accept-Encoding',
            // Hashed build assets never change under the same name.
            'Cache-Control': path.startsWith('/_astro/') ? 'public, max-age=31536000, immutable' : 'public, max-age=0, must-revalidate',
          });
          if (req.method === 'HEAD') res.end();
          else createReadStream(sent).pipe(res);
          return;
        }
      }
      compress(req, res, () => handler(req, res));
    });
    server.keepAliveTimeout = 65_000;
    server.listen(PORT, HOST, () => {
      if (!cluster.isWorker) log(`listening on http://${HOST}:${PORT}`);
      startAppWork().catch((err) => console.error('[bearline] start-up work failed', err));
    });
    const stop = () => {
      server.close(() => process.exit(0));
      server.closeIdleConnections?.();
      setTimeout(() => process.exit(0), DRAIN_MS).unref();
    };
    process.on('SIGTERM', stop);
    process.on('SIGINT', stop);
  });
}

if (cluster.isPrimary && WORKERS > 1) {
  // The workers' shared write marker (src/lib/server/write-epoch.ts): after any worker wrote, the
  // others read data versions and sessions from the database again instead of their memory.
  const epochDir = mkdtempSync(join(tmpdir(), 'bearline-epoch-'));
  process.env.BEARLINE_WRITE_EPOCH_FILE = join(epochDir, 'epoch');
  writeFileSync(process.env.BEARLINE_WRITE_EPOCH_FILE, Buffer.alloc(16));
  process.on('exit', () => rmSync(epochDir, { recursive: true, force: true }));
  let stopping = false;
  const fork = () => cluster.fork();
  for (let i = 0; i < WORKERS; i++) fork();
  let listening = 0;
  cluster.on('listening', () => {
    listening += 1;
    if (listening === WORKERS) log(`${WORKERS} workers listening on http://${HOST}:${PORT}`);
  });
  cluster.on('exit', (worker, code, signal) => {
    if (stopping) {
      if (Object.keys(cluster.workers ?? {}).length === 0) process.exit(0);
      return;
    }
    log(`worker ${worker.process.pid} stopped (${signal ?? code}); starting another`);
    setTimeout(fork, 500);
  });
  const stopAll = () => {
    stopping = true;
    for (const w of Object.values(cluster.workers ?? {})) w?.process.kill('SIGTERM');
    setTimeout(() => process.exit(0), DRAIN_MS + 1000).unref();
  };
  process.on('SIGTERM', stopAll);
  process.on('SIGINT', stopAll);
} else {
  startWorker().catch((err) => {
    console.error('[bearline] the server could not start', err);
    process.exit(1);
  });
}
