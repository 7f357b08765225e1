// The app's main navigation, filtered by what the role may do.
import { can, type Permission, type Role } from './roles';

export interface NavItem {
  href: string;
  label: string;
  permission: Permission;
}

export const NAV_ITEMS: readonly NavItem[] = [
  { href: '/admin/users', label: 'Users', permission: 'users:manage' },
];

export function navigationFor(role: Role): NavItem[] {
  return NAV_ITEMS.filter((item) => can(role, item.permission));
}
