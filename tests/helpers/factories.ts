import { testDb } from './db';
import { createUser, type User } from '../../src/lib/server/repos/users';
import type { Role } from '../../src/lib/domain/roles';
import type { SessionUser } from '../../src/lib/server/session-user';

let n = 0;
export const TEST_PASSWORD = 'correct horse battery';

export async function makeUser(role: Role, overrides: Partial<{ email: string; name: string }> = {}): Promise<User> {
  n += 1;
  return createUser(
    testDb(),
    { email: overrides.email ?? `${role}${n}@example.test`, name: overrides.name ?? `Test ${role} ${n}`, role, password: TEST_PASSWORD },
    null,
  );
}

export function asSessionUser(u: User): SessionUser {
  return { id: u.id, email: u.email, name: u.name, role: u.role };
}
