/**
 * Which sections each role sees (DESIGN.md §1). Later issues add Capture (surveyor), Review
 * (reviewer), EMC (emc) and Site setup (admin) here; a section appears only once its screen exists.
 */
import { ROLES, type Role } from '@shared/schemas/common';
import type { ShellNavItem } from '@/components/layout/app-shell';

export interface NavSection extends ShellNavItem {
  roles: readonly Role[];
  /** Shown only when the server says the feature is available (e.g. dev mail capture). */
  needs?: 'dev-mail';
}

export const NAV_SECTIONS: readonly NavSection[] = [
  { to: '/', label: 'Home', end: true, roles: ROLES },
  { to: '/sites', label: 'Site setup', roles: ['admin', 'reviewer'] },
  { to: '/instruments', label: 'Instruments', roles: ['admin', 'reviewer', 'emc'] },
  { to: '/watch-bands', label: 'Watch bands', roles: ['admin', 'reviewer', 'emc'] },
  { to: '/dev/mail', label: 'Dev mail', roles: ['admin'], needs: 'dev-mail' },
];

export interface NavContext {
  /** The role in the active organisation. */
  role: Role | undefined;
  /** Admin in any organisation (dev mail is not tied to one). */
  isAdminAnywhere: boolean;
  devMailAvailable: boolean;
}

export function navItemsFor({ role, isAdminAnywhere, devMailAvailable }: NavContext): ShellNavItem[] {
  return NAV_SECTIONS.filter((section) => {
    if (section.needs === 'dev-mail') return isAdminAnywhere && devMailAvailable;
    return role !== undefined && section.roles.includes(role);
  }).map(({ to, label, end }) => ({ to, label, end }));
}
