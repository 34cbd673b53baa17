/** What our middleware adds to Express's request and session objects. */
import type { Role } from '../../shared/schemas/common';

export interface AuthUser {
  id: string;
  email: string;
  name: string;
}

export interface OrgMembership {
  organisationId: string;
  role: Role;
}

declare module 'express-serve-static-core' {
  interface Request {
    /** Set by requireUser. */
    user?: AuthUser;
    /** Set by requireMember for /api/orgs/:orgId/… routes. */
    membership?: OrgMembership;
    /** Every organisation role of req.user, read by requireUser with the user. */
    roles?: OrgMembership[];
    /** Parsed inputs, set by validate(). */
    valid?: { body?: unknown; query?: unknown; params?: unknown };
  }
}

declare module 'express-session' {
  interface SessionData {
    userId: string;
  }
}

export {};
