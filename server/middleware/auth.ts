/**
 * Sign-in and organisation guards.
 * - requireUser: a live session whose user still exists, else 401 UNAUTHENTICATED. The user's
 *   organisation roles are read in the same query, so requireMember asks the database nothing more.
 * - requireMember(roles): for /api/orgs/:orgId/… — not a member (or no such organisation) is
 *   404 NOT_FOUND, so nobody learns which organisations exist; a member whose role may not use the
 *   route gets 403 FORBIDDEN.
 */
import type { RequestHandler } from 'express';
import type { Role } from '../../shared/schemas/common';
import { OrgParamsSchema } from '../../shared/schemas/common';
import { forbidden, notFound, unauthenticated } from '../lib/errors';
import type { AuthUser, OrgMembership } from './types';
import { parseInput } from './validate';

export interface AuthLookup {
  /** The user with every organisation role they hold: one query per request. */
  findUserWithRoles(userId: string): Promise<(AuthUser & { roles: OrgMembership[] }) | null>;
}

export function createAuthGuards(lookup: AuthLookup) {
  const requireUser: RequestHandler = async (req, _res, next) => {
    const userId = req.session?.userId;
    if (!userId) throw unauthenticated();
    const found = await lookup.findUserWithRoles(userId);
    if (!found) {
      await new Promise<void>((resolve) => req.session.destroy(() => resolve()));
      throw unauthenticated();
    }
    const { roles, ...user } = found;
    req.user = user;
    req.roles = roles;
    next();
  };

  function requireMember(roles: readonly Role[] | 'any'): RequestHandler {
    return async (req, _res, next) => {
      if (!req.user) throw unauthenticated();
      const { params } = parseInput(req, { params: OrgParamsSchema.loose() });
      // Read with the user in requireUser, in the same request: a role taken away applies from the next request.
      const membership = req.roles?.find((m) => m.organisationId === params.orgId);
      if (!membership) throw notFound('That organisation');
      if (roles !== 'any' && !roles.includes(membership.role)) throw forbidden();
      req.membership = membership;
      next();
    };
  }

  return { requireUser, requireMember };
}
export type AuthGuards = ReturnType<typeof createAuthGuards>;

export const EVERY_ROLE = 'any' as const;
