/** Invitations: create, list, look up by token hash, accept (user + membership in one transaction). */
import { and, desc, eq, gt, isNull, sql } from 'drizzle-orm';
import type { Role } from '../../../shared/schemas/common';
import { recordAudit } from '../../db/audit';
import type { Db } from '../../db/client';
import { invitations, memberships, organisations, users } from '../../db/schema';
import type { AuditContext } from '../../lib/audit-context';

export interface InvitationRow {
  id: string;
  email: string;
  role: Role;
  expiresAt: Date;
  createdAt: Date;
  invitedByName: string | null;
}

export interface PendingInvitation {
  id: string;
  organisationId: string;
  organisationName: string;
  email: string;
  role: Role;
  expiresAt: Date;
}

export type AcceptOutcome = { status: 'accepted'; userId: string } | { status: 'invalid' } | { status: 'already_member' };

const pending = () => and(isNull(invitations.acceptedAt), gt(invitations.expiresAt, sql`now()`));

export function createInvitationsRepository(db: Db) {
  return {
    async isMember(organisationId: string, email: string): Promise<boolean> {
      const [row] = await db
        .select({ userId: memberships.userId })
        .from(memberships)
        .innerJoin(users, eq(users.id, memberships.userId))
        .where(and(eq(memberships.organisationId, organisationId), sql`lower(${users.email}) = ${email.toLowerCase()}`))
        .limit(1);
      return Boolean(row);
    },

    async organisationName(organisationId: string): Promise<string | null> {
      const [row] = await db.select({ name: organisations.name }).from(organisations).where(eq(organisations.id, organisationId));
      return row?.name ?? null;
    },

    async userExists(email: string): Promise<boolean> {
      const [row] = await db.select({ id: users.id }).from(users).where(sql`lower(${users.email}) = ${email.toLowerCase()}`).limit(1);
      return Boolean(row);
    },

    async create(
      values: { organisationId: string; email: string; role: Role; tokenHash: string; invitedByUserId: string; expiresAt: Date },
      audit: AuditContext,
    ): Promise<InvitationRow> {
      return db.transaction(async (tx) => {
        const [row] = await tx.insert(invitations).values(values).returning();
        const created = row!;
        await recordAudit(tx, {
          organisationId: values.organisationId,
          actorUserId: audit.actorUserId,
          action: 'create',
          entity: 'invitations',
          entityId: created.id,
          before: null,
          after: { id: created.id, email: created.email, role: created.role, expiresAt: created.expiresAt.toISOString() },
          requestId: audit.requestId,
        });
        const [inviter] = await tx.select({ name: users.name }).from(users).where(eq(users.id, values.invitedByUserId));
        return {
          id: created.id,
          email: created.email,
          role: created.role,
          expiresAt: created.expiresAt,
          createdAt: created.createdAt,
          invitedByName: inviter?.name ?? null,
        };
      });
    },

    async listPending(organisationId: string): Promise<InvitationRow[]> {
      return db
        .select({
          id: invitations.id,
          email: invitations.email,
          role: invitations.role,
          expiresAt: invitations.expiresAt,
          createdAt: invitations.createdAt,
          invitedByName: users.name,
        })
        .from(invitations)
        .leftJoin(users, eq(users.id, invitations.invitedByUserId))
        .where(and(eq(invitations.organisationId, organisationId), pending()))
        .orderBy(desc(invitations.createdAt));
    },

    async findPending(tokenHash: string): Promise<PendingInvitation | null> {
      const [row] = await db
        .select({
          id: invitations.id,
          organisationId: invitations.organisationId,
          organisationName: organisations.name,
          email: invitations.email,
          role: invitations.role,
          expiresAt: invitations.expiresAt,
        })
        .from(invitations)
        .innerJoin(organisations, eq(organisations.id, invitations.organisationId))
        .where(and(eq(invitations.tokenHash, tokenHash), pending()))
        .limit(1);
      return row ?? null;
    },

    /**
     * Accepts in one transaction: the invitation row is locked, so a link clicked twice makes one
     * membership. `account` is either the existing user (already verified) or a new user to create.
     */
    async accept(
      tokenHash: string,
      account: { existingUserId: string } | { newUser: { name: string; email: string; passwordHash: string } },
      audit: Omit<AuditContext, 'actorUserId'>,
    ): Promise<AcceptOutcome> {
      return db.transaction(async (tx) => {
        const [invitation] = await tx.select().from(invitations).where(and(eq(invitations.tokenHash, tokenHash), pending())).for('update').limit(1);
        if (!invitation) return { status: 'invalid' };
        let userId: string;
        if ('existingUserId' in account) {
          userId = account.existingUserId;
          const [existing] = await tx
            .select({ role: memberships.role })
            .from(memberships)
            .where(and(eq(memberships.userId, userId), eq(memberships.organisationId, invitation.organisationId)));
          if (existing) return { status: 'already_member' };
        } else {
          const [created] = await tx
            .insert(users)
            .values(account.newUser)
            .returning({ id: users.id, email: users.email, name: users.name });
          userId = created!.id;
          await recordAudit(tx, {
            organisationId: invitation.organisationId,
            actorUserId: userId,
            action: 'create',
            entity: 'users',
            entityId: userId,
            before: null,
            after: created,
            requestId: audit.requestId,
          });
        }
        await tx.insert(memberships).values({ userId, organisationId: invitation.organisationId, role: invitation.role });
        await recordAudit(tx, {
          organisationId: invitation.organisationId,
          actorUserId: userId,
          action: 'create',
          entity: 'memberships',
          entityId: `${userId}:${invitation.organisationId}`,
          before: null,
          after: { userId, organisationId: invitation.organisationId, role: invitation.role, invitationId: invitation.id },
          requestId: audit.requestId,
        });
        const acceptedAt = new Date();
        await tx.update(invitations).set({ acceptedAt, acceptedByUserId: userId }).where(eq(invitations.id, invitation.id));
        await recordAudit(tx, {
          organisationId: invitation.organisationId,
          actorUserId: userId,
          action: 'accept',
          entity: 'invitations',
          entityId: invitation.id,
          before: { acceptedAt: null },
          after: { acceptedAt: acceptedAt.toISOString(), acceptedByUserId: userId },
          requestId: audit.requestId,
        });
        return { status: 'accepted', userId };
      });
    },
  };
}
export type InvitationsRepository = ReturnType<typeof createInvitationsRepository>;
