// Demo users, one per role (demo only; passwords are in the README).
import type { Knex } from 'knex';
import { hashPassword } from '../src/lib/server/password';

export const DEMO_PASSWORD = 'bearline-demo';

export const DEMO_USERS = [
  { email: 'admin@demo.bearline.test', name: 'Orla Pennick', role: 'admin' },
  { email: 'planner@demo.bearline.test', name: 'Tamsin Vey', role: 'planner' },
  { email: 'surveyor@demo.bearline.test', name: 'Bram Colley', role: 'surveyor' },
  { email: 'reviewer@demo.bearline.test', name: 'Ines Harrowgate', role: 'reviewer' },
  { email: 'contributor@demo.bearline.test', name: 'Wil Dunmarsh', role: 'contributor' },
] as const;

export async function seed(knex: Knex): Promise<void> {
  // Everything in the demo scenario hangs off users, so a reseed starts from scratch.
  await knex.raw('TRUNCATE users, sessions, audit_log, login_failures RESTART IDENTITY CASCADE');
  const hash = await hashPassword(DEMO_PASSWORD);
  await knex('users').insert(DEMO_USERS.map((u) => ({ ...u, password_hash: hash })));
}
