import { describe, expect, it } from 'vitest';
import { NAV_ITEMS, adminNavigationFor, headerNavigationFor } from '../../src/lib/domain/navigation';
import { can, ROLES } from '../../src/lib/domain/roles';

describe('navigation by role', () => {
  it.each(ROLES)('shows the %s only pages their role may open', (role) => {
    for (const item of headerNavigationFor(role)) expect(can(role, item.permission)).toBe(true);
  });

  it('folds admin pages behind one Admin entry, for admins only', () => {
    const admin = headerNavigationFor('admin').map((i) => i.href);
    expect(admin).toContain('/admin');
    expect(admin.filter((h) => h.startsWith('/admin/'))).toEqual([]);
    expect(adminNavigationFor('admin').map((i) => i.href)).toContain('/admin/users');
    for (const role of ROLES.filter((r) => r !== 'admin')) {
      expect(headerNavigationFor(role).map((i) => i.href)).not.toContain('/admin');
      expect(adminNavigationFor(role)).toEqual([]);
    }
  });

  it('gives every signed-in role the map, the regions and the tools', () => {
    for (const role of ROLES) expect(headerNavigationFor(role).map((i) => i.href)).toEqual(expect.arrayContaining(['/map', '/regions', '/tools']));
  });

  it('describes every page its card leads to, the Admin entry too (common practice: a card says what the page is for)', () => {
    for (const item of [...NAV_ITEMS, ...headerNavigationFor('admin')]) expect(item.description.trim(), item.href).not.toBe('');
  });
});
