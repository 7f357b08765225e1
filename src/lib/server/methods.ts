// Which methods each API route answers, read from what its module exports, for 405 + Allow.
import { json } from './http';

/** Pages are only read; forms post to the API. */
export const PAGE_METHODS = ['GET', 'HEAD'];

const API_MODULES = import.meta.glob<Record<string, unknown>>('/src/pages/api/**/*.ts');
const cache = new Map<string, string[] | null>();

/** The methods a route pattern (e.g. `/api/masts/[id]`) exports, HEAD with GET; null if unknown. */
export async function allowedApiMethods(routePattern: string | undefined): Promise<string[] | null> {
  if (!routePattern) return null;
  if (cache.has(routePattern)) return cache.get(routePattern)!;
  const key = [`/src/pages${routePattern}.ts`, `/src/pages${routePattern}/index.ts`].find((k) => k in API_MODULES);
  let methods: string[] | null = null;
  if (key) {
    const mod = await API_MODULES[key]!();
    methods = Object.keys(mod).filter((name) => /^[A-Z]+$/.test(name) && typeof mod[name] === 'function');
    if (methods.includes('ALL'))
      methods = null; // answers every method itself
    else if (methods.includes('GET') && !methods.includes('HEAD')) methods.push('HEAD');
  }
  cache.set(routePattern, methods);
  return methods;
}

/** 405 with Allow: the error shape for the API, plain text for pages. */
export function methodNotAllowed(api: boolean, allowed: string[]): Response {
  const allow = allowed.join(', ');
  if (api) {
    return json({ error: { code: 'METHOD_NOT_ALLOWED', message: `This route answers ${allow}` } }, 405, { Allow: allow });
  }
  return new Response(`Method not allowed. This page answers ${allow}.\n`, {
    status: 405,
    headers: { Allow: allow, 'Content-Type': 'text/plain; charset=utf-8' },
  });
}
