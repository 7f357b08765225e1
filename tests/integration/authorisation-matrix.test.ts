// Who may call what: every page and every exported API method, for anonymous visitors and each
// role, against the running app (middleware included). The table below is the one place that
// says so; the test fails when a route file or an exported method is missing from it, and when the
// table names a route that no longer exists. Add every new page or endpoint here.
import { readFileSync, readdirSync } from 'node:fs';
import { join, relative } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { APP_URL, appFetch, signInCookie } from '../helpers/app';
import { ROLES, type Role } from '../../src/lib/domain/roles';

type Method = 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE' | 'ALL';
/** 'public': anyone, signed in or not; otherwise the signed-in roles allowed. */
type Who = 'public' | readonly Role[];
interface Rule {
  /** Path (and query) to request. Writes allowed to some role aim at a missing row or send an
   * empty body, so that passing the guard shows as 400/404/409 and the demo data stays as it is. */
  path: string;
  who: Who;
  /** Exact status for those allowed, when it is not simply "no 401/403/5xx". */
  status?: number;
  /** The method to send for an `ALL` route. */
  send?: Exclude<Method, 'ALL'>;
}

const SIGNED_IN: readonly Role[] = ROLES;
const ADMIN: readonly Role[] = ['admin'];
const PLAN_VIEWERS: readonly Role[] = ['admin', 'planner', 'surveyor'];
const PLAN_WRITERS: readonly Role[] = ['admin', 'planner'];
const CHECK_RECORDERS: readonly Role[] = ['admin', 'planner', 'surveyor'];
const MAST_EDITORS: readonly Role[] = ['admin', 'reviewer'];
const REVIEWERS: readonly Role[] = ['admin', 'reviewer'];
const SUBMITTERS: readonly Role[] = ['admin', 'surveyor', 'contributor'];
const READINGS_WRITERS: readonly Role[] = ['admin', 'surveyor'];
const NONE = 999_999_999; // an id no demo row has

/** Route file (relative to src/pages) → exported method → what to request and who may. */
const ACCESS: Record<string, Partial<Record<Method, Rule | Rule[]>>> = {
  // Pages (GET)
  '403.astro': { GET: { path: '/403', who: 'public', status: 403 } },
  '404.astro': { GET: { path: '/404', who: 'public', status: 404 } },
  '500.astro': { GET: { path: '/500', who: 'public', status: 500 } },
  'index.astro': { GET: { path: '/', who: SIGNED_IN } },
  'login.astro': { GET: { path: '/login', who: 'public' } },
  'signup.astro': { GET: { path: '/signup', who: 'public' } },
  'verify.astro': { GET: { path: '/verify', who: 'public', status: 400 } },
  'forgot.astro': { GET: { path: '/forgot', who: 'public', status: 200 } },
  'reset.astro': { GET: { path: '/reset', who: 'public', status: 400 } },
  'map.astro': { GET: { path: '/map', who: SIGNED_IN } },
  'review.astro': { GET: { path: '/review', who: REVIEWERS, status: 200 } },
  'plan.astro': {
    GET: [
      { path: '/plan', who: SIGNED_IN },
      { path: '/plan?customer=1', who: PLAN_VIEWERS },
    ],
  },
  'plans/[id]/sheet.astro': { GET: { path: '/plans/1/sheet', who: PLAN_VIEWERS } },
  'schedule.astro': { GET: { path: '/schedule', who: PLAN_VIEWERS, status: 200 } },
  'tools.astro': { GET: { path: '/tools', who: SIGNED_IN } },
  'customers/index.astro': { GET: { path: '/customers', who: PLAN_VIEWERS } },
  'customers/[id].astro': { GET: { path: '/customers/1', who: PLAN_VIEWERS } },
  'admin/index.astro': { GET: { path: '/admin', who: ADMIN } },
  'admin/addresses.astro': { GET: { path: '/admin/addresses', who: ADMIN } },
  'admin/catalogue.astro': { GET: { path: '/admin/catalogue', who: ADMIN } },
  'admin/elevation.astro': { GET: { path: '/admin/elevation', who: ADMIN } },
  'admin/mailbox.astro': { GET: { path: '/admin/mailbox', who: ADMIN } },
  'admin/operators.astro': { GET: { path: '/admin/operators', who: ADMIN } },
  'admin/regions.astro': { GET: { path: '/admin/regions', who: ADMIN } },
  'admin/users.astro': { GET: { path: '/admin/users', who: ADMIN } },
  'sightings/index.astro': { GET: { path: '/sightings', who: SUBMITTERS } },
  'sightings/new.astro': { GET: { path: '/sightings/new', who: SUBMITTERS } },
  'admin/jobs.astro': { GET: { path: '/admin/jobs', who: ADMIN } },
  'readings/import.astro': { GET: { path: '/readings/import', who: READINGS_WRITERS } },
  'regions/index.astro': { GET: { path: '/regions', who: SIGNED_IN, status: 200 } },
  'regions/[id].astro': { GET: { path: '/regions/1', who: SIGNED_IN, status: 200 } },

  // API
  'api/[...path].ts': { ALL: { path: '/api/no/such/route', who: 'public', status: 404, send: 'GET' } },
  'api/health.ts': { GET: { path: '/api/health', who: 'public' } },
  'api/me.ts': { GET: { path: '/api/me', who: SIGNED_IN } },
  'api/auth/login.ts': { POST: { path: '/api/auth/login', who: 'public', status: 400 } },
  'api/auth/logout.ts': { POST: { path: '/api/auth/logout', who: 'public' } },
  'api/auth/signup.ts': { POST: { path: '/api/auth/signup', who: 'public', status: 400 } },
  'api/auth/verify.ts': { POST: { path: '/api/auth/verify', who: 'public', status: 400 } },
  'api/auth/forgot.ts': { POST: { path: '/api/auth/forgot', who: 'public', status: 400 } },
  'api/auth/reset.ts': { POST: { path: '/api/auth/reset', who: 'public', status: 400 } },
  'api/addresses/index.ts': { GET: { path: '/api/addresses', who: SIGNED_IN } },
  'api/addresses/import.ts': { POST: { path: '/api/addresses/import', who: ADMIN } },
  'api/readings/import.ts': { POST: { path: '/api/readings/import', who: READINGS_WRITERS, status: 415 } },
  'api/readings/sample.csv.ts': { GET: { path: '/api/readings/sample.csv', who: SIGNED_IN } },
  'api/regions/[id]/summary.ts': { GET: { path: '/api/regions/1/summary', who: SIGNED_IN, status: 200 } },
  'api/export/[file].ts': { GET: { path: '/api/export/masts.csv?region=1', who: SIGNED_IN, status: 200 } },
  'api/jobs/index.ts': { GET: { path: '/api/jobs', who: SIGNED_IN } },
  'api/jobs/[id].ts': { GET: { path: '/api/jobs/00000000-0000-4000-8000-000000000000', who: SIGNED_IN, status: 404 } },
  'api/catalogue/antennas/index.ts': {
    GET: { path: '/api/catalogue/antennas', who: SIGNED_IN },
    POST: { path: '/api/catalogue/antennas', who: ADMIN, status: 400 },
  },
  'api/catalogue/antennas/[id].ts': {
    GET: { path: '/api/catalogue/antennas/1', who: SIGNED_IN, status: 200 },
    PATCH: { path: `/api/catalogue/antennas/${NONE}`, who: ADMIN },
    DELETE: { path: `/api/catalogue/antennas/${NONE}`, who: ADMIN, status: 404 },
  },
  'api/catalogue/cables/index.ts': {
    GET: { path: '/api/catalogue/cables', who: SIGNED_IN },
    POST: { path: '/api/catalogue/cables', who: ADMIN, status: 400 },
  },
  'api/catalogue/cables/[id].ts': {
    GET: { path: '/api/catalogue/cables/1', who: SIGNED_IN, status: 200 },
    PATCH: { path: `/api/catalogue/cables/${NONE}`, who: ADMIN },
    DELETE: { path: `/api/catalogue/cables/${NONE}`, who: ADMIN, status: 404 },
  },
  'api/cells/[id].ts': {
    GET: { path: '/api/cells/1', who: SIGNED_IN, status: 200 },
    PATCH: { path: `/api/cells/${NONE}`, who: MAST_EDITORS },
    DELETE: { path: `/api/cells/${NONE}`, who: MAST_EDITORS, status: 404 },
  },
  'api/customers/index.ts': {
    GET: { path: '/api/customers', who: PLAN_VIEWERS, status: 200 },
    POST: { path: '/api/customers', who: PLAN_WRITERS, status: 400 },
  },
  'api/customers/[id].ts': {
    GET: { path: '/api/customers/1', who: PLAN_VIEWERS, status: 200 },
    PATCH: { path: `/api/customers/${NONE}`, who: PLAN_WRITERS },
  },
  'api/customers/[id]/erasure.ts': { POST: { path: `/api/customers/${NONE}/erasure`, who: PLAN_WRITERS, status: 404 } },
  'api/customers/[id]/history.ts': { GET: { path: '/api/customers/1/history', who: PLAN_VIEWERS, status: 200 } },
  'api/elevation/index.ts': {
    GET: { path: '/api/elevation', who: SIGNED_IN, status: 200 },
    POST: { path: '/api/elevation', who: ADMIN },
  },
  'api/elevation/[id].ts': {
    GET: { path: `/api/elevation/${NONE}`, who: SIGNED_IN, status: 404 },
    DELETE: { path: `/api/elevation/${NONE}`, who: ADMIN, status: 404 },
  },
  'api/elevation/sample.ts': { GET: { path: '/api/elevation/sample?lat=0&lon=0', who: SIGNED_IN } },
  'api/geocode/index.ts': { GET: { path: '/api/geocode?q=mill', who: SIGNED_IN, status: 200 } },
  'api/mail/index.ts': { GET: { path: '/api/mail', who: ADMIN, status: 200 } },
  'api/mail/test.ts': { POST: { path: '/api/mail/test', who: ADMIN } },
  'api/map/style.json.ts': { GET: { path: '/api/map/style.json', who: SIGNED_IN, status: 200 } },
  'api/masts/index.ts': {
    GET: { path: '/api/masts', who: SIGNED_IN, status: 200 },
    POST: { path: '/api/masts', who: MAST_EDITORS, status: 400 },
  },
  'api/masts/[id].ts': {
    GET: { path: '/api/masts/1', who: SIGNED_IN, status: 200 },
    PATCH: { path: `/api/masts/${NONE}`, who: MAST_EDITORS },
    DELETE: { path: `/api/masts/${NONE}`, who: MAST_EDITORS, status: 404 },
  },
  'api/masts/[id]/surveys.ts': { GET: { path: '/api/masts/1/surveys', who: SIGNED_IN, status: 200 } },
  'api/masts/[id]/cells.ts': {
    GET: { path: '/api/masts/1/cells', who: SIGNED_IN, status: 200 },
    POST: { path: `/api/masts/${NONE}/cells`, who: MAST_EDITORS },
  },
  'api/operators/index.ts': {
    GET: { path: '/api/operators', who: SIGNED_IN, status: 200 },
    POST: { path: '/api/operators', who: ADMIN, status: 400 },
  },
  'api/operators/[id].ts': {
    GET: { path: '/api/operators/1', who: SIGNED_IN, status: 200 },
    PATCH: { path: `/api/operators/${NONE}`, who: ADMIN },
  },
  'api/plans/index.ts': {
    GET: { path: '/api/plans', who: PLAN_VIEWERS, status: 200 },
    POST: { path: '/api/plans', who: PLAN_WRITERS, status: 400 },
  },
  'api/plans/[id].ts': {
    GET: { path: '/api/plans/1', who: PLAN_VIEWERS, status: 200 },
    PATCH: { path: `/api/plans/${NONE}`, who: PLAN_WRITERS },
  },
  'api/plans/[id]/installed.ts': { POST: { path: `/api/plans/${NONE}/installed`, who: CHECK_RECORDERS, status: 400 } },
  'api/plans/[id]/checks.ts': {
    GET: { path: '/api/plans/1/checks', who: PLAN_VIEWERS, status: 200 },
    POST: { path: `/api/plans/${NONE}/checks`, who: CHECK_RECORDERS },
  },
  'api/regions/index.ts': {
    GET: { path: '/api/regions', who: SIGNED_IN, status: 200 },
    POST: { path: '/api/regions', who: ADMIN, status: 400 },
  },
  'api/regions/[id].ts': {
    GET: { path: '/api/regions/1', who: SIGNED_IN, status: 200 },
    PATCH: { path: `/api/regions/${NONE}`, who: ADMIN },
    DELETE: { path: `/api/regions/${NONE}`, who: ADMIN, status: 404 },
  },
  'api/review/sightings.ts': { GET: { path: '/api/review/sightings', who: REVIEWERS, status: 200 } },
  'api/sightings/index.ts': {
    GET: [
      { path: '/api/sightings?mine=1', who: SUBMITTERS, status: 200 },
      { path: '/api/sightings', who: REVIEWERS, status: 200 },
    ],
    // A JSON body instead of the multipart form: past the guard it is 415.
    POST: { path: '/api/sightings', who: SUBMITTERS, status: 415 },
  },
  // Someone else's sighting does not exist for those who submit or review; other roles are refused.
  'api/sightings/[id].ts': { GET: { path: `/api/sightings/${NONE}`, who: [...REVIEWERS, 'surveyor', 'contributor'], status: 404 } },
  'api/sightings/pending.ts': { GET: { path: '/api/sightings/pending', who: SIGNED_IN, status: 200 } },
  'api/sightings/photos/[id]/[variant].ts': {
    GET: [
      { path: `/api/sightings/photos/${NONE}/thumb`, who: SIGNED_IN, status: 404 },
      { path: `/api/sightings/photos/${NONE}/original`, who: REVIEWERS, status: 404 },
    ],
  },
  'api/sightings/[id]/decision.ts': { POST: { path: `/api/sightings/${NONE}/decision`, who: REVIEWERS } },
  'api/search/index.ts': { GET: { path: '/api/search?q=mast', who: SIGNED_IN, status: 200 } },
  'api/shortlist/index.ts': { GET: { path: '/api/shortlist?lat=0&lon=0', who: SIGNED_IN } },
  'api/tiles/[layer]/[z]/[x]/[y].mvt.ts': {
    GET: [
      { path: '/api/tiles/basemap/0/0/0.mvt', who: 'public' },
      { path: '/api/tiles/masts/0/0/0.mvt', who: SIGNED_IN },
      { path: '/api/tiles/signal/0/0/0.mvt', who: SIGNED_IN },
    ],
  },
  'api/tools/channel.ts': { GET: { path: '/api/tools/channel?tech=lte&channel=6300', who: SIGNED_IN, status: 200 } },
  'api/tools/path.ts': { GET: { path: '/api/tools/path?from=0,0&to=0.1,0.1&freq_mhz=800', who: SIGNED_IN } },
  'api/users/index.ts': {
    GET: { path: '/api/users', who: ADMIN, status: 200 },
    POST: { path: '/api/users', who: ADMIN, status: 400 },
  },
  'api/users/[id]/invite.ts': { POST: { path: `/api/users/${NONE}/invite`, who: ADMIN, status: 404 } },
  'api/users/[id].ts': {
    GET: { path: '/api/users/1', who: ADMIN, status: 200 },
    PATCH: { path: `/api/users/${NONE}`, who: ADMIN },
  },
};

// --- What exists ------------------------------------------------------------------------------

const PAGES_DIR = join(import.meta.dirname, '../../src/pages');
const PAGE_EXT = /\.(astro|md|mdx|html)$/;
const ENDPOINT_EXT = /\.(ts|js|mjs)$/;
const METHOD_EXPORT = /export\s+(?:const|async\s+function|function)\s+(GET|POST|PUT|PATCH|DELETE|OPTIONS|HEAD|ALL)\b/g;

function listFiles(dir: string): string[] {
  return readdirSync(dir, { withFileTypes: true }).flatMap((e) => (e.isDirectory() ? listFiles(join(dir, e.name)) : [join(dir, e.name)]));
}

/** Every route file with the methods it answers: GET for pages, the exported ones for endpoints. */
function listRoutes(): Map<string, string[]> {
  const routes = new Map<string, string[]>();
  for (const file of listFiles(PAGES_DIR)) {
    const key = relative(PAGES_DIR, file).split('\\').join('/');
    if (PAGE_EXT.test(key)) routes.set(key, ['GET']);
    else if (ENDPOINT_EXT.test(key)) routes.set(key, [...new Set([...readFileSync(file, 'utf8').matchAll(METHOD_EXPORT)].map((m) => m[1]))].sort());
  }
  return routes;
}

describe('the access table', () => {
  const routes = listRoutes();

  it('finds the route files (sanity)', () => {
    expect(routes.get('api/masts/[id].ts')).toEqual(['DELETE', 'GET', 'PATCH']);
    expect(routes.get('map.astro')).toEqual(['GET']);
  });

  it('names every page and every exported method', () => {
    const missing = [...routes].flatMap(([file, methods]) => methods.filter((m) => !ACCESS[file]?.[m as Method]).map((m) => `${m} ${file}`));
    expect(missing, 'add these to ACCESS in tests/integration/authorisation-matrix.test.ts').toEqual([]);
  });

  it('names nothing that does not exist', () => {
    const stale = Object.entries(ACCESS).flatMap(([file, methods]) =>
      Object.keys(methods)
        .filter((m) => !routes.get(file)?.includes(m))
        .map((m) => `${m} ${file}`),
    );
    expect(stale).toEqual([]);
  });
});

// --- What each caller gets --------------------------------------------------------------------

interface Case {
  file: string;
  method: Exclude<Method, 'ALL'>;
  rule: Rule;
}
const CASES: Case[] = Object.entries(ACCESS).flatMap(([file, methods]) =>
  Object.entries(methods).flatMap(([method, rules]) =>
    [rules!].flat().map((rule) => ({ file, method: method === 'ALL' ? (rule.send ?? 'GET') : (method as Exclude<Method, 'ALL'>), rule })),
  ),
);
const isPage = (file: string) => PAGE_EXT.test(file);
const label = (c: Case) => `${c.method} ${c.rule.path}`;

async function request(c: Case, cookie?: string): Promise<Response> {
  const write = c.method !== 'GET';
  return appFetch(c.rule.path, {
    method: c.method,
    cookie,
    headers: write ? { origin: APP_URL, 'content-type': 'application/json', accept: 'application/json' } : {},
    body: write && c.method !== 'DELETE' ? '{}' : undefined,
  });
}

async function expectAllowed(c: Case, res: Response, who: string): Promise<void> {
  const where = `${label(c)} as ${who}`;
  if (c.rule.status !== undefined) expect(res.status, where).toBe(c.rule.status);
  else {
    expect([401, 403], where).not.toContain(res.status);
    expect(res.status, where).toBeLessThan(500);
  }
  expect(res.headers.get('location') ?? '', where).not.toMatch(/^\/login/);
  await res.body?.cancel();
}

async function expectRefused(c: Case, res: Response, anonymous: boolean): Promise<void> {
  const where = `${label(c)} as ${anonymous ? 'anonymous' : 'role'}`;
  if (isPage(c.file)) {
    if (anonymous) {
      expect(res.status, where).toBe(302);
      expect(res.headers.get('location'), where).toMatch(/^\/login\?next=/);
      await res.body?.cancel();
    } else {
      expect(res.status, where).toBe(403);
      const html = await res.text();
      expect(html, where).not.toMatch(/"lat":|"address_label"|addressLabel/);
    }
    return;
  }
  expect(res.status, where).toBe(anonymous ? 401 : 403);
  const body = await res.json();
  expect(body.error.code, where).toBe(anonymous ? 'UNAUTHORIZED' : 'FORBIDDEN');
}

describe('access by role', () => {
  const cookies = new Map<Role, string>();
  beforeAll(async () => {
    for (const role of ROLES) cookies.set(role, await signInCookie(role));
  });

  it.each(CASES.map((c) => [label(c), c] as const))('anonymous: %s', async (_, c) => {
    const res = await request(c);
    if (c.rule.who === 'public') await expectAllowed(c, res, 'anonymous');
    else await expectRefused(c, res, true);
  });

  for (const role of ROLES) {
    it.each(CASES.map((c) => [label(c), c] as const))(`${role}: %s`, async (_, c) => {
      // Signing out ends the session: use a session of its own.
      const cookie = c.file === 'api/auth/logout.ts' ? await signInCookie(role) : cookies.get(role)!;
      const res = await request(c, cookie);
      if (c.rule.who === 'public' || c.rule.who.includes(role)) await expectAllowed(c, res, role);
      else await expectRefused(c, res, false);
    });
  }
});
