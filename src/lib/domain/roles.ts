// Roles and what each may do. Islands use `can` to hide controls; server
// guards always check again.

export const ROLES = ['admin', 'planner', 'surveyor', 'reviewer', 'contributor'] as const;
export type Role = (typeof ROLES)[number];

export type Permission =
  | 'map:view'
  | 'tools:use'
  | 'users:manage'
  | 'reference:manage' // operators, regions, catalogue, data imports
  | 'masts:write'
  | 'plans:view' // customers, plans and install checks (personal contact details)
  | 'plans:write'
  | 'readings:write'
  | 'sightings:submit'
  | 'sightings:review'
  | 'mail:view';

// Every signed-in role can view the map and the tools. Beyond that a role
// includes nothing implicitly, except that admin can do everything.
const EVERYONE: readonly Permission[] = ['map:view', 'tools:use'];
const GRANTS: Record<Exclude<Role, 'admin'>, readonly Permission[]> = {
  planner: [...EVERYONE, 'plans:view', 'plans:write'],
  surveyor: [...EVERYONE, 'plans:view', 'readings:write', 'sightings:submit'],
  reviewer: [...EVERYONE, 'masts:write', 'sightings:review'],
  contributor: [...EVERYONE, 'sightings:submit'],
};

export function isRole(value: unknown): value is Role {
  return typeof value === 'string' && (ROLES as readonly string[]).includes(value);
}

export function can(role: Role | null | undefined, permission: Permission): boolean {
  if (!role) return false;
  if (role === 'admin') return true;
  return GRANTS[role].includes(permission);
}

export const ROLE_LABELS: Record<Role, string> = {
  admin: 'Admin',
  planner: 'Planner',
  surveyor: 'Surveyor',
  reviewer: 'Reviewer',
  contributor: 'Contributor',
};
