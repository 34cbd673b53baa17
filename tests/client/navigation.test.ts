import { describe, expect, it } from 'vitest';
import { ROLES } from '@shared/schemas/common';
import { navItemsFor } from '@/app/navigation';

const labels = (...args: Parameters<typeof navItemsFor>) => navItemsFor(...args).map((item) => item.label);

describe('role-aware navigation', () => {
  it.each(ROLES)('a %s sees Home', (role) => {
    expect(labels({ role, isAdminAnywhere: role === 'admin', devMailAvailable: false })).toEqual(['Home']);
  });

  it('an admin sees Dev mail only when the server runs the mail capture', () => {
    expect(labels({ role: 'admin', isAdminAnywhere: true, devMailAvailable: true })).toEqual(['Home', 'Dev mail']);
    expect(labels({ role: 'admin', isAdminAnywhere: true, devMailAvailable: false })).toEqual(['Home']);
  });

  it.each(ROLES.filter((r) => r !== 'admin'))('a %s never sees Dev mail, even when it is available', (role) => {
    expect(labels({ role, isAdminAnywhere: false, devMailAvailable: true })).toEqual(['Home']);
  });

  it('a user with no organisation sees no sections', () => {
    expect(labels({ role: undefined, isAdminAnywhere: false, devMailAvailable: false })).toEqual([]);
  });
});
