import { beforeEach, describe, expect, it } from 'vitest';
import { POST as login } from '../../src/pages/api/auth/login';
import { GET as me } from '../../src/pages/api/me';
import { lucia } from '../../src/lib/server/auth';
import { updateUser } from '../../src/lib/server/repos/users';
import { call } from '../helpers/endpoint';
import { testDb, truncateAll } from '../helpers/db';
import { makeUser, TEST_PASSWORD, asSessionUser } from '../helpers/factories';

describe('sign-in', () => {
  beforeEach(truncateAll);

  it('signs in with the right password, e-mail case-insensitively', async () => {
    const u = await makeUser('planner', { email: 'Tess.Planner@example.test' });
    const res = await call(login, { json: { email: 'tess.planner@EXAMPLE.test', password: TEST_PASSWORD } });
    expect(res.status).toBe(200);
    expect(res.body.user).toMatchObject({ id: u.id, role: 'planner' });
    const [{ count }] = await testDb()('sessions').where({ user_id: u.id }).count();
    expect(Number(count)).toBe(1);
  });

  it('refuses a wrong password with 401 and one message', async () => {
    await makeUser('planner', { email: 'p@example.test' });
    const res = await call(login, { json: { email: 'p@example.test', password: 'not the password' } });
    expect(res.status).toBe(401);
    expect(res.body.error).toEqual({ code: 'UNAUTHORIZED', message: 'Wrong e-mail or password' });
  });

  it('refuses an unknown e-mail with the same message', async () => {
    const res = await call(login, { json: { email: 'nobody@example.test', password: 'whatever-it-is' } });
    expect(res.status).toBe(401);
    expect(res.body.error.message).toBe('Wrong e-mail or password');
  });

  it('refuses a disabled user', async () => {
    const admin = await makeUser('admin');
    const u = await makeUser('surveyor', { email: 's@example.test' });
    await updateUser(testDb(), u.id, { disabled: true }, admin.id);
    const res = await call(login, { json: { email: 's@example.test', password: TEST_PASSWORD } });
    expect(res.status).toBe(401);
    expect(res.body.error.message).toMatch(/disabled/);
  });

  it('rejects malformed input with 400 and fields', async () => {
    const res = await call(login, { json: { email: 'not-an-email', password: '' } });
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields).sort()).toEqual(['email', 'password']);
  });

  it('sends a body that is neither JSON nor a form back to the sign-in page', async () => {
    const res = await call(login, { body: '<xml/>', headers: { 'content-type': 'application/xml' } });
    expect(res.status).toBe(303); // a non-JSON client is treated as a form and sent back to the page
    expect(res.headers.get('location')).toMatch(/^\/login\?error=/);
  });

  it('sends a form post back to the page with the error, and to next on success', async () => {
    await makeUser('reviewer', { email: 'r@example.test' });
    const bad = await call(login, { form: { email: 'r@example.test', password: 'nope-nope', next: '/admin/users' } });
    expect(bad.status).toBe(303);
    expect(bad.headers.get('location')).toBe('/login?error=credentials&next=%2Fadmin%2Fusers');
    const good = await call(login, { form: { email: 'r@example.test', password: TEST_PASSWORD, next: '/admin/users' } });
    expect(good.status).toBe(303);
    expect(good.headers.get('location')).toBe('/admin/users');
    const offsite = await call(login, { form: { email: 'r@example.test', password: TEST_PASSWORD, next: '//evil.test/x' } });
    expect(offsite.headers.get('location')).toBe('/');
  });
});

describe('sessions', () => {
  beforeEach(truncateAll);

  it('expires: a session past its expiry no longer validates', async () => {
    const u = await makeUser('planner');
    const session = await lucia.createSession(u.id, {});
    expect((await lucia.validateSession(session.id)).user?.id).toBe(u.id);
    await testDb()('sessions')
      .where({ id: session.id })
      .update({ expires_at: new Date(Date.now() - 1000) });
    const after = await lucia.validateSession(session.id);
    expect(after.session).toBeNull();
    expect(after.user).toBeNull();
  });

  it('GET /api/me answers 401 JSON when signed out and the user when signed in', async () => {
    const anon = await call(me);
    expect(anon.status).toBe(401);
    expect(anon.body.error.code).toBe('UNAUTHORIZED');
    const u = await makeUser('contributor');
    const res = await call(me, { user: asSessionUser(u) });
    expect(res.status).toBe(200);
    expect(res.body.user.role).toBe('contributor');
  });
});
