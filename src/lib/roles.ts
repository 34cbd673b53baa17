import type { Role } from '@shared/schemas/common';

/** How each role is named on screen (DESIGN.md §1). */
export const ROLE_LABELS: Record<Role, string> = {
  admin: 'Admin',
  reviewer: 'Reviewer',
  emc: 'EMC engineer',
  surveyor: 'Surveyor',
  viewer: 'Viewer',
};
