// Mail goes through the real local SMTP catcher started by scripts/test.ts and shows in the admin mailbox.
import { describe, expect, it } from 'vitest';
import { POST as sendTest } from '../../src/pages/api/mail/test';
import { GET as listMail } from '../../src/pages/api/mail/index';
import { call } from '../helpers/endpoint';
import { truncateAll } from '../helpers/db';
import { asSessionUser, makeUser } from '../helpers/factories';

describe('mailbox', () => {
  it('refuses everyone but admins (401/403)', async () => {
    await truncateAll();
    expect((await call(listMail)).status).toBe(401);
    const planner = asSessionUser(await makeUser('planner'));
    expect((await call(listMail, { user: planner })).status).toBe(403);
    expect((await call(sendTest, { user: planner, method: 'POST', headers: { accept: 'application/json' } })).status).toBe(403);
  });

  it('sends a test message over SMTP and lists it', async () => {
    const admin = asSessionUser(await makeUser('admin', { email: 'boss.mail@example.test' }));
    const res = await call(sendTest, { user: admin, method: 'POST', headers: { accept: 'application/json' } });
    expect(res.status).toBe(200);
    const list = await call(listMail, { user: admin });
    const mine = list.body.items.find((m: { to: string }) => m.to.includes('boss.mail@example.test'));
    expect(mine).toMatchObject({ subject: 'Bearline test message' });
    expect(mine.text).toContain('Mail delivery works');
  });
});
