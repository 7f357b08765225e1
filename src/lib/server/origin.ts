// Refuses state-changing requests from a foreign origin, whatever the content
// type (Astro's own check only covers form content types).

const WRITE_METHODS = new Set(['POST', 'PUT', 'PATCH', 'DELETE']);

export function isForeignWrite(request: Request, url: URL): boolean {
  if (!WRITE_METHODS.has(request.method)) return false;
  const origin = request.headers.get('origin');
  if (origin) return origin !== url.origin;
  // No Origin header: browsers always send one on cross-site writes; fall back
  // to the fetch metadata header when present.
  const site = request.headers.get('sec-fetch-site');
  return site === 'cross-site';
}
