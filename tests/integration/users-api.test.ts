import { beforeEach, describe, expect, it } from 'vitest';
import { GET as listUsers, POST as createUser } from '../../src/pages/api/users/index';
import { GET as getUser, PATCH as patchUser } from '../../src/pages/api/users/[id]';
import { ROLES } from '../../src/lib/domain/roles';
import { call } from '../helpers/endpoint';
import { testDb, truncateAll } from '../helpers/db';
import { makeUser, asSessionUser } from '../helpers/factories';

describe('users API', () => {
  beforeEach(truncateAll);

  it('answers 401 when signed out', async () => {
    const res = await call(listUsers);
    expect(res.status).toBe(401);
    expect(res.body).toEqual({ error: { code: 'UNAUTHORIZED', message: 'Sign in first' } });
  });

  it.each(ROLES.filter((r) => r !== 'admin'))('answers 403 to a %s', async (role) => {
    const u = await makeUser(role);
    const list = await call(listUsers, { user: asSessionUser(u) });
    expect(list.status).toBe(403);
    expect(list.body.error.code).toBe('FORBIDDEN');
    const create = await call(createUser, { user: asSessionUser(u), json: { email: 'x@example.test', name: 'X', role: 'admin' } });
    expect(create.status).toBe(403);
    expect(await testDb()('users').where({ email: 'x@example.test' }).first()).toBeUndefined();
  });

  it('lets an admin list, invite and audit a user', async () => {
    const admin = asSessionUser(await makeUser('admin'));
    const created = await call(createUser, { user: admin, json: { email: 'new@example.test', name: 'New Person', role: 'surveyor' } });
    expect(created.status).toBe(201);
    expect(created.body).toMatchObject({ email: 'new@example.test', role: 'surveyor', disabled_at: null, invite: 'pending' });
    expect(created.body).not.toHaveProperty('passwordHash');
    const list = await call(listUsers, { user: admin });
    expect(list.body.total).toBe(2);
    const audit = await testDb()('audit_log').where({ entity: 'user', entity_id: created.body.id }).first();
    expect(audit).toMatchObject({ action: 'create', user_id: admin.id });
    expect(audit.after).toMatchObject({ email: 'new@example.test', role: 'surveyor' });
  });

  it('rejects bad input with 400 and a fields map', async () => {
    const admin = asSessionUser(await makeUser('admin'));
    const res = await call(createUser, { user: admin, json: { email: 'nope', name: '', role: 'wizard' } });
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields).sort()).toEqual(['email', 'name', 'role']);
  });

  it('refuses a duplicate e-mail (any case) with 409', async () => {
    const admin = asSessionUser(await makeUser('admin', { email: 'boss@example.test' }));
    const res = await call(createUser, { user: admin, json: { email: 'BOSS@example.test', name: 'Dup', role: 'planner' } });
    expect(res.status).toBe(409);
  });

  it("changes a role and disables / enables, audited, ending the disabled user's sessions", async () => {
    const admin = asSessionUser(await makeUser('admin'));
    const target = await makeUser('planner');
    await testDb()('sessions').insert({ id: 'abc', user_id: target.id, expires_at: new Date(Date.now() + 3600_000) });
    const role = await call(patchUser, { method: 'PATCH', user: admin, params: { id: target.id }, json: { role: 'reviewer' } });
    expect(role.status).toBe(200);
    expect(role.body.role).toBe('reviewer');
    const off = await call(patchUser, { method: 'PATCH', user: admin, params: { id: target.id }, json: { disabled: true } });
    expect(off.body.disabled_at).not.toBeNull();
    expect(await testDb()('sessions').where({ user_id: target.id }).first()).toBeUndefined();
    const on = await call(patchUser, { method: 'PATCH', user: admin, params: { id: target.id }, json: { disabled: false } });
    expect(on.body.disabled_at).toBeNull();
    const actions = await testDb()('audit_log').where({ entity: 'user', entity_id: target.id, action: 'update' });
    expect(actions).toHaveLength(3);
  });

  it('does not let an admin disable themselves or drop their own admin role', async () => {
    const admin = asSessionUser(await makeUser('admin'));
    const res = await call(patchUser, { method: 'PATCH', user: admin, params: { id: admin.id }, json: { disabled: true } });
    expect(res.status).toBe(400);
    expect(res.body.error.fields.disabled).toBeDefined();
    const demote = await call(patchUser, { method: 'PATCH', user: admin, params: { id: admin.id }, json: { role: 'planner' } });
    expect(demote.status).toBe(400);
  });

  it('answers 404 for an unknown user and 400 for a malformed id', async () => {
    const admin = asSessionUser(await makeUser('admin'));
    expect((await call(getUser, { user: admin, params: { id: '999999' } })).status).toBe(404);
    expect((await call(getUser, { user: admin, params: { id: 'abc' } })).status).toBe(400);
  });
});
