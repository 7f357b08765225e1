// The app's main navigation, filtered by what the role may do.
import { can, type Permission, type Role } from './roles';

export interface NavItem {
  href: string;
  label: string;
  permission: Permission;
}

export const NAV_ITEMS: readonly NavItem[] = [
  { href: '/map', label: 'Map', permission: 'map:view' },
  { href: '/regions', label: 'Regions', permission: 'map:view' },
  { href: '/plan', label: 'Plan', permission: 'plans:write' },
  { href: '/schedule', label: 'Schedule', permission: 'plans:view' },
  { href: '/review', label: 'Review', permission: 'sightings:review' },
  { href: '/tools', label: 'Tools', permission: 'tools:use' },
  { href: '/sightings', label: 'Sightings', permission: 'sightings:submit' },
  { href: '/admin/operators', label: 'Operators', permission: 'reference:manage' },
  { href: '/admin/regions', label: 'Regions', permission: 'reference:manage' },
  { href: '/admin/users', label: 'Users', permission: 'users:manage' },
  { href: '/admin/mailbox', label: 'Mailbox', permission: 'mail:view' },
  { href: '/admin/elevation', label: 'Elevation', permission: 'reference:manage' },
  { href: '/customers', label: 'Customers', permission: 'plans:view' },
  { href: '/admin/catalogue', label: 'Catalogue', permission: 'reference:manage' },
  { href: '/admin/addresses', label: 'Addresses', permission: 'reference:manage' },
  { href: '/readings/import', label: 'Import readings', permission: 'readings:write' },
  { href: '/admin/jobs', label: 'Jobs', permission: 'users:manage' },
];

export function navigationFor(role: Role): NavItem[] {
  return NAV_ITEMS.filter((item) => can(role, item.permission));
}

const isAdminPage = (item: NavItem) => item.href.startsWith('/admin/');

/** The header: everyday pages, then one "Admin" entry leading to the admin pages. */
export function headerNavigationFor(role: Role): NavItem[] {
  const items = navigationFor(role);
  const main = items.filter((i) => !isAdminPage(i));
  return items.some(isAdminPage) ? [...main, { href: '/admin', label: 'Admin', permission: 'users:manage' }] : main;
}

export function adminNavigationFor(role: Role): NavItem[] {
  return navigationFor(role).filter(isAdminPage);
}
