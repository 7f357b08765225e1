// The app's main navigation, filtered by what the role may do.
import { can, type Permission, type Role } from './roles';

export interface NavItem {
  href: string;
  label: string;
  permission: Permission;
  /** One line under the label on the home and admin pages' cards. */
  description: string;
}

export const NAV_ITEMS: readonly NavItem[] = [
  { href: '/map', label: 'Map', permission: 'map:view', description: 'Masts, operators and cells across the regions you serve' },
  { href: '/regions', label: 'Regions', permission: 'map:view', description: 'Each region’s masts, bands and measured signal at a glance' },
  { href: '/plan', label: 'Plan', permission: 'plans:write', description: 'Turn a customer address into the best cell, kit and aim' },
  { href: '/schedule', label: 'Schedule', permission: 'plans:view', description: 'Booked install visits by day, with the aim sheet one tap away' },
  { href: '/review', label: 'Review', permission: 'sightings:review', description: 'Sightings from the field: approve, merge or reject each one' },
  { href: '/tools', label: 'Tools', permission: 'tools:use', description: 'Channel numbers, distances, bearings and clearance' },
  { href: '/sightings', label: 'Sightings', permission: 'sightings:submit', description: 'Report a mast you found and follow what the reviewers decide' },
  { href: '/admin/operators', label: 'Operators', permission: 'reference:manage', description: 'Network operators, their codes and map colours' },
  { href: '/admin/regions', label: 'Regions', permission: 'reference:manage', description: 'Named areas the team serves' },
  { href: '/admin/users', label: 'Users', permission: 'users:manage', description: 'Accounts, roles, disabling people who have left' },
  { href: '/admin/mailbox', label: 'Mailbox', permission: 'mail:view', description: 'Mail sent by Bearline (local catcher)' },
  { href: '/admin/elevation', label: 'Elevation', permission: 'reference:manage', description: 'Elevation data for terrain clearance' },
  { href: '/customers', label: 'Customers', permission: 'plans:view', description: 'Enquiries, plans, installs and their measured results' },
  { href: '/admin/catalogue', label: 'Catalogue', permission: 'reference:manage', description: 'Antennas and cables with gain and loss over frequency' },
  { href: '/admin/addresses', label: 'Addresses', permission: 'reference:manage', description: 'The address gazetteer used by the planner' },
  { href: '/readings/import', label: 'Import readings', permission: 'readings:write', description: 'A day’s drive-survey log in as one CSV, matched to cells' },
  { href: '/admin/jobs', label: 'Jobs', permission: 'users:manage', description: 'Imports and other long work, with their progress and results' },
];

const ADMIN_ENTRY: NavItem = {
  href: '/admin',
  label: 'Admin',
  permission: 'users:manage',
  description: 'Users, operators, regions, catalogue and data imports',
};

export function navigationFor(role: Role): NavItem[] {
  return NAV_ITEMS.filter((item) => can(role, item.permission));
}

const isAdminPage = (item: NavItem) => item.href.startsWith('/admin/');

/** The header: everyday pages, then one "Admin" entry leading to the admin pages. */
export function headerNavigationFor(role: Role): NavItem[] {
  const items = navigationFor(role);
  const main = items.filter((i) => !isAdminPage(i));
  return items.some(isAdminPage) ? [...main, ADMIN_ENTRY] : main;
}

export function adminNavigationFor(role: Role): NavItem[] {
  return navigationFor(role).filter(isAdminPage);
}
