// The app's main navigation, filtered by what the role may do.
import { can, type Permission, type Role } from './roles';

export interface NavItem {
  href: string;
  label: string;
  permission: Permission;
}

export const NAV_ITEMS: readonly NavItem[] = [
  { href: '/map', label: 'Map', permission: 'map:view' },
  { href: '/admin/operators', label: 'Operators', permission: 'reference:manage' },
  { href: '/admin/regions', label: 'Regions', permission: 'reference:manage' },
  { href: '/admin/users', label: 'Users', permission: 'users:manage' },
];

export function navigationFor(role: Role): NavItem[] {
  return NAV_ITEMS.filter((item) => can(role, item.permission));
}
