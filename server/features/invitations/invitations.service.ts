/**
 * Invitations by e-mail: an admin invites an address with a role; the link carries a one-time token
 * valid for INVITATION_VALID_MS; accepting creates the account (or, for an existing account, checks
 * its password) and the membership, and signs the person in.
 */
import type { Invitation } from '../../../shared/schemas/invitation';
import type { InvitationPreview } from '../../../shared/schemas/auth';
import type { Role } from '../../../shared/schemas/common';
import { AppError, notFound } from '../../lib/errors';
import type { Mailer } from '../../lib/mail';
import { hashToken, newToken } from '../../lib/tokens';
import type { AuthUser } from '../../middleware/types';
import { invitationMail } from './invitations.mail';
import type { InvitationRow, InvitationsRepository } from './invitations.repository';

export const INVITATION_VALID_MS = 7 * 24 * 60 * 60 * 1000;

const toWire = (row: InvitationRow): Invitation => ({
  id: row.id,
  email: row.email,
  role: row.role,
  expiresAt: row.expiresAt.toISOString(),
  createdAt: row.createdAt.toISOString(),
  invitedByName: row.invitedByName,
});

const invalidInvitation = () => notFound('That invitation (it may have expired or been used already)');

/** What this feature needs from accounts (the auth feature provides it; passed in by createApp). */
export interface AccountChecks {
  verifyCredentials(email: string, password: string): Promise<AuthUser>;
  findUser(userId: string): Promise<AuthUser | null>;
  hashPassword(password: string): Promise<string>;
}

export function createInvitationsService(deps: { repo: InvitationsRepository; auth: AccountChecks; mailer: Mailer; publicUrl: string }) {
  const { repo, auth, mailer, publicUrl } = deps;

  return {
    async invite(input: { organisationId: string; email: string; role: Role; inviter: AuthUser; requestId?: string }): Promise<Invitation> {
      if (await repo.isMember(input.organisationId, input.email)) {
        throw new AppError('ALREADY_MEMBER', `${input.email} is already a member of this organisation.`, { field: 'email' });
      }
      const organisationName = (await repo.organisationName(input.organisationId)) ?? 'your organisation';
      const { token, tokenHash } = newToken();
      const row = await repo.create(
        {
          organisationId: input.organisationId,
          email: input.email.toLowerCase(),
          role: input.role,
          tokenHash,
          invitedByUserId: input.inviter.id,
          expiresAt: new Date(Date.now() + INVITATION_VALID_MS),
        },
        { actorUserId: input.inviter.id, requestId: input.requestId },
      );
      try {
        await mailer.send(
          invitationMail({
            to: row.email,
            organisationName,
            inviterName: input.inviter.name,
            role: row.role,
            link: `${publicUrl}/invitations/${token}`,
            validDays: INVITATION_VALID_MS / 86_400_000,
          }),
        );
      } catch (error) {
        // The invitation stays listed as pending; the admin can invite again once mail works.
        throw new AppError('SERVICE_UNAVAILABLE', 'The invitation was saved but the e-mail could not be sent. Try again later.', {
          invitationId: row.id,
          cause: error instanceof Error ? error.message : String(error),
        });
      }
      return toWire(row);
    },

    async listPending(organisationId: string): Promise<Invitation[]> {
      return (await repo.listPending(organisationId)).map(toWire);
    },

    async preview(token: string): Promise<InvitationPreview> {
      const invitation = await repo.findPending(hashToken(token));
      if (!invitation) throw invalidInvitation();
      return {
        email: invitation.email,
        organisationName: invitation.organisationName,
        role: invitation.role,
        expiresAt: invitation.expiresAt.toISOString(),
        hasAccount: await repo.userExists(invitation.email),
      };
    },

    /** Returns the user to sign in. */
    async accept(token: string, input: { name: string; password: string }, requestId?: string): Promise<AuthUser> {
      const tokenHash = hashToken(token);
      const invitation = await repo.findPending(tokenHash);
      if (!invitation) throw invalidInvitation();
      const exists = await repo.userExists(invitation.email);
      const account = exists
        ? { existingUserId: (await auth.verifyCredentials(invitation.email, input.password)).id }
        : { newUser: { name: input.name, email: invitation.email, passwordHash: await auth.hashPassword(input.password) } };
      const outcome = await repo.accept(tokenHash, account, { requestId });
      if (outcome.status === 'invalid') throw invalidInvitation();
      if (outcome.status === 'already_member') throw new AppError('ALREADY_MEMBER', 'You are already a member of this organisation.');
      const user = await auth.findUser(outcome.userId);
      if (!user) throw invalidInvitation();
      return user;
    },
  };
}
export type InvitationsService = ReturnType<typeof createInvitationsService>;
