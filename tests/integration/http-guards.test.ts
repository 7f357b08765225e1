// Against the running app (middleware included): page guards, origin check, health.
import { describe, expect, it } from 'vitest';
import { APP_URL, appFetch, signInCookie } from '../helpers/app';
import { ROLES } from '../../src/lib/domain/roles';

describe('page guard', () => {
  it('redirects a signed-out visitor to sign-in with next', async () => {
    const res = await appFetch('/admin/users');
    expect(res.status).toBe(302);
    expect(res.headers.get('location')).toBe('/login?next=%2Fadmin%2Fusers');
  });

  it.each(ROLES)('lets only admin open the users page (%s)', async (role) => {
    const cookie = await signInCookie(role);
    const res = await appFetch('/admin/users', { cookie });
    expect(res.status).toBe(role === 'admin' ? 200 : 403);
    const api = await appFetch('/api/users', { cookie });
    expect(api.status).toBe(role === 'admin' ? 200 : 403);
  });
});

describe('origin check on writes', () => {
  it('refuses a foreign-origin JSON POST with 403', async () => {
    const res = await appFetch('/api/auth/login', {
      method: 'POST',
      headers: { origin: 'http://elsewhere.test', 'content-type': 'application/json' },
      body: JSON.stringify({ email: 'admin@demo.bearline.test', password: 'bearline-demo' }),
    });
    expect(res.status).toBe(403);
    expect(res.headers.get('set-cookie')).toBeNull();
  });

  it('refuses a foreign-origin form POST with 403', async () => {
    const res = await appFetch('/api/auth/login', {
      method: 'POST',
      headers: { origin: 'http://elsewhere.test', 'content-type': 'application/x-www-form-urlencoded' },
      body: 'email=admin%40demo.bearline.test&password=bearline-demo',
    });
    expect(res.status).toBe(403);
  });

  it('refuses a foreign-origin PATCH by a signed-in admin', async () => {
    const cookie = await signInCookie('admin');
    const res = await appFetch('/api/users/2', {
      method: 'PATCH',
      cookie,
      headers: { origin: 'http://elsewhere.test', 'content-type': 'application/json' },
      body: JSON.stringify({ role: 'admin' }),
    });
    expect(res.status).toBe(403);
  });

  it('accepts a same-origin form sign-in', async () => {
    const res = await appFetch('/api/auth/login', {
      method: 'POST',
      headers: { origin: APP_URL, 'content-type': 'application/x-www-form-urlencoded' },
      body: 'email=planner%40demo.bearline.test&password=bearline-demo&next=%2F',
    });
    expect(res.status).toBe(303);
    expect(res.headers.get('set-cookie')).toMatch(/bearline_session=\w+; .*HttpOnly/i);
    expect(res.headers.get('set-cookie')).toMatch(/SameSite=Lax/i);
  });
});

describe('health', () => {
  it('reports PostgreSQL and PostGIS versions', async () => {
    const res = await appFetch('/api/health');
    expect(res.status).toBe(200);
    const body = await res.json();
    expect(body.ok).toBe(true);
    expect(body.db).toMatch(/^PostgreSQL 1\d/);
    expect(body.postgis).toMatch(/^3\.\d/);
  });

  it('answers a page 404 for unknown pages and a JSON 404 for unknown API routes', async () => {
    const res = await appFetch('/no/such/page');
    expect(res.status).toBe(404);
    expect(await res.text()).toContain('Nothing here');
    const api = await appFetch('/api/no/such/route');
    expect(api.status).toBe(404);
    expect((await api.json()).error.code).toBe('NOT_FOUND');
  });
});
