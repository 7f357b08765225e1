import type { Role } from '../domain/roles';

/** The signed-in user as pages and endpoints see it. */
export interface SessionUser {
  id: string;
  email: string;
  name: string;
  role: Role;
}
