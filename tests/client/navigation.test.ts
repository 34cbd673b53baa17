import { describe, expect, it } from 'vitest';
import { ROLES, type Role } from '@shared/schemas/common';
import { navItemsFor } from '@/app/navigation';

const labels = (...args: Parameters<typeof navItemsFor>) => navItemsFor(...args).map((item) => item.label);

/**
 * What each role may reach (README "Roles"): site setup for admins and reviewers, instruments and
 * watch bands for those who keep or read them.
 */
const EXPECTED: Record<Role, string[]> = {
  admin: ['Home', 'Site setup', 'Instruments', 'Watch bands'],
  reviewer: ['Home', 'Site setup', 'Instruments', 'Watch bands'],
  emc: ['Home', 'Instruments', 'Watch bands'],
  surveyor: ['Home'],
  viewer: ['Home'],
};

describe('role-aware navigation', () => {
  it.each(ROLES)('a %s sees exactly the sections of that role', (role) => {
    expect(labels({ role, isAdminAnywhere: role === 'admin', devMailAvailable: false })).toEqual(EXPECTED[role]);
  });

  it('an admin sees Dev mail only when the server runs the mail capture', () => {
    expect(labels({ role: 'admin', isAdminAnywhere: true, devMailAvailable: true })).toEqual([...EXPECTED.admin, 'Dev mail']);
    expect(labels({ role: 'admin', isAdminAnywhere: true, devMailAvailable: false })).toEqual(EXPECTED.admin);
  });

  it.each(ROLES.filter((r) => r !== 'admin'))('a %s never sees Dev mail, even when it is available', (role) => {
    expect(labels({ role, isAdminAnywhere: false, devMailAvailable: true })).toEqual(EXPECTED[role]);
  });

  it('a user with no organisation sees no sections', () => {
    expect(labels({ role: undefined, isAdminAnywhere: false, devMailAvailable: false })).toEqual([]);
  });
});
