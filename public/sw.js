// Bearline's service worker for the sighting pages (scope /sightings): the pages and the assets
// they use are kept, so a surveyor with no signal can still open the form. Sightings themselves
// are kept in IndexedDB by the page and sent when the connection returns.
const CACHE = 'bearline-sightings-v1';
const PAGES = ['/sightings/new', '/sightings'];

self.addEventListener('install', (event) => {
  event.waitUntil(
    caches
      .open(CACHE)
      .then((cache) => Promise.all(PAGES.map((p) => fetch(p, { credentials: 'same-origin' }).then((r) => (r.ok && !r.redirected ? cache.put(p, r) : undefined)).catch(() => undefined))))
      .then(() => self.skipWaiting()),
  );
});

self.addEventListener('activate', (event) => {
  event.waitUntil(
    caches
      .keys()
      .then((names) => Promise.all(names.filter((n) => n.startsWith('bearline-sightings-') && n !== CACHE).map((n) => caches.delete(n))))
      .then(() => self.clients.claim()),
  );
});

self.addEventListener('message', (event) => {
  const data = event.data;
  if (!data || data.type !== 'cache-urls' || !Array.isArray(data.urls)) return;
  const urls = data.urls.filter((u) => typeof u === 'string' && new URL(u).origin === self.location.origin);
  event.waitUntil(
    caches.open(CACHE).then((cache) =>
      Promise.all(
        urls.map((u) =>
          cache.match(u).then((hit) => hit || fetch(u, { credentials: 'same-origin' }).then((r) => (r.ok ? cache.put(u, r) : undefined)).catch(() => undefined)),
        ),
      ),
    ),
  );
});

const isAsset = (url) => url.pathname.startsWith('/_astro/') || url.pathname.startsWith('/fonts/');
const isPage = (url) => PAGES.includes(url.pathname.replace(/\/$/, '') || '/');
const isCachedApi = (url) => url.pathname === '/api/operators';

async function networkFirst(request, key) {
  const cache = await caches.open(CACHE);
  try {
    const response = await fetch(request);
    if (response.ok && !response.redirected) await cache.put(key, response.clone());
    return response;
  } catch (err) {
    const hit = await cache.match(key);
    if (hit) return hit;
    throw err;
  }
}

async function cacheFirst(request) {
  const cache = await caches.open(CACHE);
  const hit = await cache.match(request);
  if (hit) return hit;
  const response = await fetch(request);
  if (response.ok) await cache.put(request, response.clone());
  return response;
}

self.addEventListener('fetch', (event) => {
  const request = event.request;
  if (request.method !== 'GET') return;
  const url = new URL(request.url);
  if (url.origin !== self.location.origin) return;
  if (request.mode === 'navigate' && isPage(url)) event.respondWith(networkFirst(request, url.pathname.replace(/\/$/, '')));
  else if (isAsset(url)) event.respondWith(cacheFirst(request));
  else if (isCachedApi(url)) event.respondWith(networkFirst(request, url.pathname));
});
