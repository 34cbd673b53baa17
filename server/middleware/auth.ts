/**
 * Sign-in and organisation guards.
 * - requireUser: a live session whose user still exists, else 401 UNAUTHENTICATED.
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
  findUser(userId: string): Promise<AuthUser | null>;
  findMembership(userId: string, organisationId: string): Promise<OrgMembership | null>;
}

export function createAuthGuards(lookup: AuthLookup) {
  const requireUser: RequestHandler = async (req, _res, next) => {
    const userId = req.session?.userId;
    if (!userId) throw unauthenticated();
    const user = await lookup.findUser(userId);
    if (!user) {
      await new Promise<void>((resolve) => req.session.destroy(() => resolve()));
      throw unauthenticated();
    }
    req.user = user;
    next();
  };

  function requireMember(roles: readonly Role[] | 'any'): RequestHandler {
    return async (req, _res, next) => {
      if (!req.user) throw unauthenticated();
      const { params } = parseInput(req, { params: OrgParamsSchema.loose() });
      const membership = await lookup.findMembership(req.user.id, params.orgId);
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
