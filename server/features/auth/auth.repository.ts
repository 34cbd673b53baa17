/** Users, memberships, sessions and password-reset tokens: the only auth code that touches Drizzle. */
import { and, eq, gt, isNull, sql } from 'drizzle-orm';
import type { Role } from '../../../shared/schemas/common';
import { recordAudit } from '../../db/audit';
import type { Db } from '../../db/client';
import { memberships, organisations, passwordResetTokens, users } from '../../db/schema';
import type { AuditContext } from '../../lib/audit-context';
import type { AuthUser, OrgMembership } from '../../middleware/types';

export interface UserWithHash extends AuthUser {
  passwordHash: string;
}

export interface MembershipView {
  organisationId: string;
  organisationName: string;
  role: Role;
}

export function createAuthRepository(db: Db) {
  return {
    async findUserByEmail(email: string): Promise<UserWithHash | null> {
      const [row] = await db
        .select({ id: users.id, email: users.email, name: users.name, passwordHash: users.passwordHash })
        .from(users)
        .where(sql`lower(${users.email}) = ${email.toLowerCase()}`)
        .limit(1);
      return row ?? null;
    },

    async findUser(userId: string): Promise<AuthUser | null> {
      const [row] = await db.select({ id: users.id, email: users.email, name: users.name }).from(users).where(eq(users.id, userId)).limit(1);
      return row ?? null;
    },

    /** The user and every organisation role they hold, in one query (what each signed-in request needs). */
    async findUserWithRoles(userId: string): Promise<(AuthUser & { roles: OrgMembership[] }) | null> {
      const rows = await db
        .select({ id: users.id, email: users.email, name: users.name, organisationId: memberships.organisationId, role: memberships.role })
        .from(users)
        .leftJoin(memberships, eq(memberships.userId, users.id))
        .where(eq(users.id, userId));
      const first = rows[0];
      if (!first) return null;
      const roles = rows.flatMap((r) => (r.organisationId && r.role ? [{ organisationId: r.organisationId, role: r.role }] : []));
      return { id: first.id, email: first.email, name: first.name, roles };
    },

    async listMemberships(userId: string): Promise<MembershipView[]> {
      return db
        .select({ organisationId: memberships.organisationId, organisationName: organisations.name, role: memberships.role })
        .from(memberships)
        .innerJoin(organisations, eq(organisations.id, memberships.organisationId))
        .where(eq(memberships.userId, userId))
        .orderBy(organisations.name);
    },

    /** A sign-in or sign-out, as an audit row of the user's own account (outside any organisation). */
    async recordSessionEvent(userId: string, action: 'sign_in' | 'sign_out', requestId: string | null): Promise<void> {
      await recordAudit(db, { organisationId: null, actorUserId: userId, action, entity: 'users', entityId: userId, before: null, after: null, requestId });
    },

    async createResetToken(userId: string, tokenHash: string, expiresAt: Date, audit: AuditContext): Promise<void> {
      await db.transaction(async (tx) => {
        const [token] = await tx.insert(passwordResetTokens).values({ userId, tokenHash, expiresAt }).returning({ id: passwordResetTokens.id });
        // A user's own account is outside any organisation: organisationId stays null.
        await recordAudit(tx, {
          organisationId: null,
          actorUserId: audit.actorUserId,
          action: 'create',
          entity: 'password_reset_tokens',
          entityId: token!.id,
          before: null,
          after: { id: token!.id, userId, expiresAt: expiresAt.toISOString() },
          requestId: audit.requestId,
        });
      });
    },

    async resetTokenIsUsable(tokenHash: string): Promise<boolean> {
      const [row] = await db
        .select({ id: passwordResetTokens.id })
        .from(passwordResetTokens)
        .where(and(eq(passwordResetTokens.tokenHash, tokenHash), isNull(passwordResetTokens.usedAt), gt(passwordResetTokens.expiresAt, sql`now()`)))
        .limit(1);
      return Boolean(row);
    },

    /**
     * Uses a reset token and sets the new password in one transaction: the token row is locked, so two
     * confirms racing with one token cannot both succeed. Every other session of the user ends, and
     * every other unused token of theirs is spent. Returns the user id, or null for a bad token.
     */
    async resetPassword(tokenHash: string, newPasswordHash: string, audit: Omit<AuditContext, 'actorUserId'>): Promise<string | null> {
      return db.transaction(async (tx) => {
        const [token] = await tx
          .select({ id: passwordResetTokens.id, userId: passwordResetTokens.userId })
          .from(passwordResetTokens)
          .where(and(eq(passwordResetTokens.tokenHash, tokenHash), isNull(passwordResetTokens.usedAt), gt(passwordResetTokens.expiresAt, sql`now()`)))
          .for('update')
          .limit(1);
        if (!token) return null;
        await tx
          .update(passwordResetTokens)
          .set({ usedAt: sql`now()` })
          .where(and(eq(passwordResetTokens.userId, token.userId), isNull(passwordResetTokens.usedAt)));
        await tx.update(users).set({ passwordHash: newPasswordHash, updatedAt: sql`now()` }).where(eq(users.id, token.userId));
        await tx.execute(sql`DELETE FROM "session" WHERE sess->>'userId' = ${token.userId}`);
        await recordAudit(tx, {
          organisationId: null,
          actorUserId: token.userId,
          action: 'update',
          entity: 'users',
          entityId: token.userId,
          // Never the hashes themselves: the audit log is readable by admins.
          before: { password: 'old' },
          after: { password: 'changed', via: 'password_reset_tokens', resetTokenId: token.id },
          requestId: audit.requestId,
        });
        return token.userId;
      });
    },
  };
}
export type AuthRepository = ReturnType<typeof createAuthRepository>;
