import { describe, expect, it } from 'vitest';
import { can, isRole, ROLES } from '../../src/lib/domain/roles';

// Role rules from the product's own design, no outside source: admin can do everything,
// other roles include nothing implicitly.
describe('can', () => {
  it.each([
    ['planner', 'plans:write', true],
    ['planner', 'sightings:review', false],
    ['surveyor', 'sightings:submit', true],
    ['surveyor', 'masts:write', false],
    ['reviewer', 'sightings:review', true],
    ['reviewer', 'plans:write', false],
    ['contributor', 'sightings:submit', true],
    ['contributor', 'readings:write', false],
    ['contributor', 'users:manage', false],
    ['admin', 'users:manage', true],
  ] as const)('%s → %s is %s', (role, permission, expected) => {
    expect(can(role, permission)).toBe(expected);
  });

  it('refuses everything to nobody', () => {
    expect(can(null, 'map:view')).toBe(false);
  });

  it('recognises the five roles only', () => {
    expect(ROLES.every(isRole)).toBe(true);
    expect(isRole('root')).toBe(false);
  });
});
