// Accounts by e-mail against the real database and the local mail catcher: sign-up with a
// confirmation link, password reset, invitations. Token rules: random, stored only as SHA-256,
// single use, expiring; answers that do not reveal whether an address has an account.
import { createHash } from 'node:crypto';
import { beforeEach, describe, expect, it } from 'vitest';
import { POST as signup } from '../../src/pages/api/auth/signup';
import { POST as verify } from '../../src/pages/api/auth/verify';
import { POST as forgot } from '../../src/pages/api/auth/forgot';
import { POST as reset } from '../../src/pages/api/auth/reset';
import { GET as listUsers, POST as inviteUser } from '../../src/pages/api/users/index';
import { POST as resendInvite } from '../../src/pages/api/users/[id]/invite';
import { authenticate } from '../../src/lib/server/auth';
import { PATCH as patchUser } from '../../src/pages/api/users/[id]';
import { ROLES } from '../../src/lib/domain/roles';
import { call } from '../helpers/endpoint';
import { testDb, truncateAll } from '../helpers/db';
import { TEST_PASSWORD, asSessionUser, makeUser } from '../helpers/factories';
import { linkToken, mailTo, waitForMailTo } from '../helpers/mail';

const run = Date.now().toString(36);
let seq = 0;
const freshEmail = (who: string) => `${who}.${run}.${++seq}@example.test`;
const sha256 = (s: string) => createHash('sha256').update(s).digest('hex');
const NEW_PASSWORD = 'a brand new long password';

/** Distinct client addresses keep the per-IP limit out of tests about something else. */
let ipSeq = 0;
const callFrom = (route: Parameters<typeof call>[0], opts: Parameters<typeof call>[1]) => {
  ipSeq += 1;
  return call(route, { ...opts, clientAddress: `10.9.${Math.floor(ipSeq / 250)}.${ipSeq % 250}` });
};

beforeEach(truncateAll);

describe('sign-up with a confirmation link', () => {
  it('mails a single-use link stored only as its SHA-256, and makes the contributor account when followed', async () => {
    const email = freshEmail('newcomer');
    const res = await callFrom(signup, { json: { name: 'Nia Fenwold', email, password: 'my own long password' } });
    expect(res.status).toBe(202);
    expect(res.body.message).toMatch(/sent a message/);
    expect(await testDb()('users').whereRaw('lower(email) = ?', [email]).first()).toBeUndefined();

    const [mail] = await waitForMailTo(email);
    expect(mail!.subject).toBe('Confirm your e-mail for Bearline');
    expect(mail!.html).toContain('/verify?token=');
    const token = linkToken(mail!.text, '/verify');
    expect(token.length).toBeGreaterThanOrEqual(43); // 32 random bytes, base64url

    const row = await testDb()('account_tokens').where({ purpose: 'signup' }).first();
    expect(row.token_hash).toBe(sha256(token));
    expect(JSON.stringify(row)).not.toContain(token);
    expect(row.password_hash).toMatch(/^\$argon2id\$/);
    expect(row.expires_at.getTime() - row.created_at.getTime()).toBe(24 * 3600_000);

    const ok = await call(verify, { json: { token } });
    expect(ok.status).toBe(201);
    expect(ok.body.user).toMatchObject({ email, name: 'Nia Fenwold', role: 'contributor' });
    expect(await testDb()('sessions').where({ user_id: ok.body.user.id }).first()).toBeDefined();
    expect((await authenticate(email, 'my own long password', '127.0.0.9')).role).toBe('contributor');
    const audit = await testDb()('audit_log').where({ entity: 'user', entity_id: ok.body.user.id, action: 'create' }).first();
    expect(audit.after).toMatchObject({ role: 'contributor', via: 'signup' });

    const again = await call(verify, { json: { token } });
    expect(again.status).toBe(400);
    expect(again.body.error.message).toMatch(/already been used/);
    expect(await testDb()('users').whereRaw('lower(email) = ?', [email]).count('* as n').first()).toEqual({ n: '1' });
  });

  it('answers the same for an address that already has an account, mails its owner, and issues no link', async () => {
    const owner = await makeUser('planner', { email: freshEmail('owner') });
    const unknown = await callFrom(signup, { json: { name: 'Someone', email: freshEmail('nobody'), password: 'another long password' } });
    const known = await callFrom(signup, { json: { name: 'Someone', email: owner.email.toUpperCase(), password: 'another long password' } });
    expect(known.status).toBe(unknown.status);
    expect(known.body).toEqual(unknown.body);
    const [mail] = await waitForMailTo(owner.email);
    expect(mail!.subject).toBe('You already have a Bearline account');
    expect(mail!.text).toContain('/forgot');
    expect(await testDb()('account_tokens').whereRaw('lower(email) = lower(?)', [owner.email]).first()).toBeUndefined();
  });

  it('lets only one of two links for the same address make an account', async () => {
    const email = freshEmail('twice');
    await callFrom(signup, { json: { name: 'Twice', email, password: 'first long password' } });
    await callFrom(signup, { json: { name: 'Twice', email, password: 'second long password' } });
    const mails = await waitForMailTo(email, 2);
    const [t1, t2] = mails.map((m) => linkToken(m.text, '/verify'));
    expect((await call(verify, { json: { token: t2 } })).status).toBe(201);
    const late = await call(verify, { json: { token: t1 } });
    expect(late.status).toBe(400);
    expect(late.body.error.message).toMatch(/already been used/);
  });

  it('refuses an expired, unknown or malformed link with 400 and the reason', async () => {
    const email = freshEmail('late');
    await callFrom(signup, { json: { name: 'Late', email, password: 'a long enough password' } });
    const token = linkToken((await waitForMailTo(email))[0]!.text, '/verify');
    await testDb()('account_tokens').update({ expires_at: new Date(Date.now() - 1000) });
    const expired = await call(verify, { json: { token } });
    expect(expired.status).toBe(400);
    expect(expired.body.error.message).toMatch(/expired/);
    const unknown = await call(verify, { json: { token: 'A'.repeat(43) } });
    expect(unknown.status).toBe(400);
    expect(unknown.body.error.message).toMatch(/not valid/);
    const malformed = await call(verify, { json: { token: 'short<script>' } });
    expect(malformed.status).toBe(400);
    expect(Object.keys(malformed.body.error.fields)).toEqual(['token']);
    expect(await testDb()('users').count('* as n').first()).toEqual({ n: '0' });
  });

  it('gives one account when the same link is followed twice at once', async () => {
    const email = freshEmail('race');
    await callFrom(signup, { json: { name: 'Race', email, password: 'a long enough password' } });
    const token = linkToken((await waitForMailTo(email))[0]!.text, '/verify');
    const [a, b] = await Promise.all([call(verify, { json: { token } }), call(verify, { json: { token } })]);
    expect([a.status, b.status].sort()).toEqual([201, 400]);
    expect(await testDb()('users').count('* as n').first()).toEqual({ n: '1' });
  });

  it.each([
    [{ name: '', email: 'not-an-address', password: 'short' }, ['email', 'name', 'password']],
    [{ email: 'ok@example.test', password: 'a long enough password' }, ['name']],
  ])('rejects bad sign-up input with 400 and fields (%j)', async (body, fields) => {
    const res = await callFrom(signup, { json: body });
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields).sort()).toEqual(fields);
  });

  it('throttles sign-ups per e-mail (429 with Retry-After), whether or not the address is known', async () => {
    const owner = await makeUser('surveyor', { email: freshEmail('busy') });
    for (const email of [freshEmail('spam'), owner.email]) {
      for (let i = 0; i < 3; i += 1) expect((await callFrom(signup, { json: { name: 'X', email, password: 'a long enough password' } })).status).toBe(202);
      const blocked = await callFrom(signup, { json: { name: 'X', email, password: 'a long enough password' } });
      expect(blocked.status).toBe(429);
      expect(blocked.body.error.code).toBe('TOO_MANY_REQUESTS');
      expect(Number(blocked.headers.get('retry-after'))).toBeGreaterThan(3000);
    }
  });

  it('throttles sign-ups per IP address', async () => {
    for (let i = 0; i < 20; i += 1) {
      expect(
        (await call(signup, { clientAddress: '192.0.2.7', json: { name: 'X', email: freshEmail('ip'), password: 'a long enough password' } })).status,
      ).toBe(202);
    }
    const blocked = await call(signup, { clientAddress: '192.0.2.7', json: { name: 'X', email: freshEmail('ip'), password: 'a long enough password' } });
    expect(blocked.status).toBe(429);
  });
});

describe('password reset by e-mail', () => {
  it('mails a one-hour link that sets the password once, ends sessions and retires other links', async () => {
    const user = await makeUser('planner', { email: freshEmail('forgetful') });
    await testDb()('sessions').insert({ id: 'old-session', user_id: user.id, expires_at: new Date(Date.now() + 3600_000) });
    expect((await callFrom(forgot, { json: { email: user.email } })).status).toBe(202);
    expect((await callFrom(forgot, { json: { email: user.email } })).status).toBe(202);
    const mails = await waitForMailTo(user.email, 2);
    expect(mails[0]!.subject).toBe('Choose a new Bearline password');
    expect(mails[0]!.html).toContain('/reset?token=');
    const [first, second] = mails.map((m) => linkToken(m.text, '/reset'));
    const rows = await testDb()('account_tokens').where({ purpose: 'reset', user_id: user.id });
    expect(rows.map((r) => r.token_hash).sort()).toEqual([sha256(first!), sha256(second!)].sort());
    expect(rows[0].expires_at.getTime() - rows[0].created_at.getTime()).toBe(3600_000);

    const short = await call(reset, { json: { token: first, password: 'short' } });
    expect(short.status).toBe(400);
    expect(Object.keys(short.body.error.fields)).toEqual(['password']);

    const ok = await call(reset, { json: { token: first, password: NEW_PASSWORD } });
    expect(ok.status).toBe(200);
    expect(ok.body.user.id).toBe(user.id);
    expect(await testDb()('sessions').where({ id: 'old-session' }).first()).toBeUndefined();
    await expect(authenticate(user.email, TEST_PASSWORD, '127.0.0.9')).rejects.toThrow(/Wrong e-mail or password/);
    expect((await authenticate(user.email, NEW_PASSWORD, '127.0.0.9')).id).toBe(user.id);
    const audit = await testDb()('audit_log').where({ entity: 'user', entity_id: user.id, action: 'set_password' }).first();
    expect(audit.after).toEqual({ via: 'reset' });

    for (const used of [first, second]) {
      const res = await call(reset, { json: { token: used, password: 'yet another long password' } });
      expect(res.status).toBe(400);
      expect(res.body.error.message).toMatch(/already been used/);
    }
  });

  it('answers an unknown or disabled address exactly like a known one, and mails nothing', async () => {
    const known = await makeUser('surveyor', { email: freshEmail('known') });
    const disabled = await makeUser('surveyor', { email: freshEmail('gone') });
    await testDb()('users').where({ id: disabled.id }).update({ disabled_at: new Date() });
    const answers = await Promise.all([known.email, disabled.email, freshEmail('stranger')].map((email) => callFrom(forgot, { json: { email } })));
    expect(new Set(answers.map((a) => JSON.stringify([a.status, a.body]))).size).toBe(1);
    await waitForMailTo(known.email);
    await new Promise((r) => setTimeout(r, 300));
    expect(await mailTo(disabled.email)).toEqual([]);
    expect(await testDb()('account_tokens').where({ user_id: disabled.id }).first()).toBeUndefined();
  });

  it('refuses an expired reset link and leaves the password alone', async () => {
    const user = await makeUser('planner', { email: freshEmail('slow') });
    await callFrom(forgot, { json: { email: user.email } });
    const token = linkToken((await waitForMailTo(user.email))[0]!.text, '/reset');
    await testDb()('account_tokens')
      .where({ user_id: user.id })
      .update({ expires_at: new Date(Date.now() - 1) });
    const res = await call(reset, { json: { token, password: NEW_PASSWORD } });
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/expired/);
    expect((await authenticate(user.email, TEST_PASSWORD, '127.0.0.9')).id).toBe(user.id);
  });

  it('refuses a link of another kind (a sign-up link cannot set a password)', async () => {
    const email = freshEmail('kind');
    await callFrom(signup, { json: { name: 'Kind', email, password: 'a long enough password' } });
    const token = linkToken((await waitForMailTo(email))[0]!.text, '/verify');
    expect((await call(reset, { json: { token, password: NEW_PASSWORD } })).status).toBe(400);
  });

  it('throttles reset requests per e-mail', async () => {
    const email = freshEmail('hammer');
    for (let i = 0; i < 3; i += 1) expect((await callFrom(forgot, { json: { email } })).status).toBe(202);
    expect((await callFrom(forgot, { json: { email } })).status).toBe(429);
  });
});

describe('invitations', () => {
  it('lets an admin invite a person, who chooses a password from the mailed link', async () => {
    const admin = asSessionUser(await makeUser('admin', { name: 'Orla Admin' }));
    const email = freshEmail('invitee');
    const res = await call(inviteUser, { user: admin, json: { email, name: 'Ivo Marsh', role: 'surveyor' } });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ email, role: 'surveyor', invite: 'pending', mail_sent: true });
    expect(res.body).not.toHaveProperty('passwordHash');

    const [mail] = await mailTo(email);
    expect(mail!.subject).toBe('You are invited to Bearline');
    expect(mail!.text).toContain('Orla Admin has made you a Bearline account as surveyor');
    const token = linkToken(mail!.text, '/reset');
    const row = await testDb()('account_tokens').where({ purpose: 'invite', user_id: res.body.id }).first();
    expect(row.token_hash).toBe(sha256(token));
    expect(row.expires_at.getTime() - row.created_at.getTime()).toBe(7 * 24 * 3600_000);

    const list = await call(listUsers, { user: admin });
    expect(list.body.items.find((u: { id: string }) => u.id === res.body.id).invite).toBe('pending');
    const audit = await testDb()('audit_log').where({ entity: 'user', entity_id: res.body.id }).orderBy('id');
    expect(audit.map((a) => a.action)).toEqual(['create', 'invite']);

    const set = await call(reset, { json: { token, password: NEW_PASSWORD } });
    expect(set.status).toBe(200);
    expect((await authenticate(email, NEW_PASSWORD, '127.0.0.9')).role).toBe('surveyor');
    const after = await call(listUsers, { user: admin });
    expect(after.body.items.find((u: { id: string }) => u.id === res.body.id).invite).toBeNull();
    expect((await call(reset, { json: { token, password: 'again a long password' } })).status).toBe(400);
    const resend = await call(resendInvite, { user: admin, params: { id: res.body.id } });
    expect(resend.status).toBe(409);
  });

  it('resends an invitation with a new link; the old link stops working', async () => {
    const admin = asSessionUser(await makeUser('admin'));
    const email = freshEmail('again');
    const created = await call(inviteUser, { user: admin, json: { email, name: 'Again', role: 'planner' } });
    const oldToken = linkToken((await mailTo(email))[0]!.text, '/reset');
    await testDb()('account_tokens')
      .where({ user_id: created.body.id })
      .update({ expires_at: new Date(Date.now() - 1) });
    const list = await call(listUsers, { user: admin });
    expect(list.body.items.find((u: { id: string }) => u.id === created.body.id).invite).toBe('expired');

    const resent = await call(resendInvite, { user: admin, params: { id: created.body.id } });
    expect(resent.status).toBe(200);
    expect(resent.body).toMatchObject({ invite: 'pending', mail_sent: true });
    const mails = await mailTo(email);
    expect(mails).toHaveLength(2);
    const newToken = linkToken(mails[1]!.text, '/reset');
    expect(newToken).not.toBe(oldToken);
    expect((await call(reset, { json: { token: oldToken, password: NEW_PASSWORD } })).status).toBe(400);
    expect((await call(reset, { json: { token: newToken, password: NEW_PASSWORD } })).status).toBe(200);
  });

  it('cannot be used by a disabled account', async () => {
    const admin = asSessionUser(await makeUser('admin'));
    const email = freshEmail('disabled');
    const created = await call(inviteUser, { user: admin, json: { email, name: 'Gone', role: 'planner' } });
    const token = linkToken((await mailTo(email))[0]!.text, '/reset');
    await call(patchUser, { method: 'PATCH', user: admin, params: { id: created.body.id }, json: { disabled: true } });
    const res = await call(reset, { json: { token, password: NEW_PASSWORD } });
    expect(res.status).toBe(403);
    expect(await testDb()('sessions').where({ user_id: created.body.id }).first()).toBeUndefined();
  });

  it('refuses bad invitations (400 with fields, 409 for a known e-mail) and unknown users (404)', async () => {
    const admin = asSessionUser(await makeUser('admin', { email: freshEmail('boss') }));
    const bad = await call(inviteUser, { user: admin, json: { email: 'nope', name: '', role: 'wizard' } });
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.error.fields).sort()).toEqual(['email', 'name', 'role']);
    expect((await call(inviteUser, { user: admin, json: { email: admin.email.toUpperCase(), name: 'Dup', role: 'planner' } })).status).toBe(409);
    expect((await call(resendInvite, { user: admin, params: { id: '999999' } })).status).toBe(404);
    expect((await call(resendInvite, { user: admin, params: { id: 'abc' } })).status).toBe(400);
  });

  it.each(ROLES.filter((r) => r !== 'admin'))('is for admins only (a %s gets 403; signed out 401)', async (role) => {
    const u = asSessionUser(await makeUser(role));
    const target = await makeUser('planner');
    expect((await call(inviteUser, { user: u, json: { email: freshEmail('x'), name: 'X', role: 'planner' } })).status).toBe(403);
    expect((await call(resendInvite, { user: u, params: { id: target.id } })).status).toBe(403);
    expect((await call(inviteUser, { json: { email: freshEmail('x'), name: 'X', role: 'planner' } })).status).toBe(401);
    expect((await call(resendInvite, { params: { id: target.id } })).status).toBe(401);
  });
});
