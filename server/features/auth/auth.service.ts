/**
 * Sign-in, session contents and password reset. Unknown e-mails take as long as wrong passwords
 * (a dummy hash is verified) and password-reset requests answer the same whether or not the
 * account exists, so neither endpoint tells an outsider who has an account.
 */
import type { Session } from '../../../shared/schemas/auth';
import { AppError } from '../../lib/errors';
import type { Logger } from '../../lib/logger';
import type { Mailer } from '../../lib/mail';
import { hashToken, newToken } from '../../lib/tokens';
import type { AuthUser } from '../../middleware/types';
import { passwordResetMail } from './auth.mail';
import type { AuthRepository } from './auth.repository';
import { DUMMY_HASH_PROMISE, hashPassword, verifyPassword } from './password';

export const PASSWORD_RESET_VALID_MS = 60 * 60 * 1000;

export function createAuthService(deps: { repo: AuthRepository; mailer: Mailer; publicUrl: string; logger: Logger }) {
  const { repo, mailer, publicUrl, logger } = deps;

  async function sessionFor(user: AuthUser): Promise<Session> {
    const memberships = await repo.listMemberships(user.id);
    return { user: { id: user.id, email: user.email, name: user.name }, memberships };
  }

  async function sendResetLink(email: string, requestId: string | undefined): Promise<void> {
    const user = await repo.findUserByEmail(email);
    if (!user) return;
    const { token, tokenHash } = newToken();
    await repo.createResetToken(user.id, tokenHash, new Date(Date.now() + PASSWORD_RESET_VALID_MS), { actorUserId: null, requestId });
    const link = `${publicUrl}/reset-password?token=${encodeURIComponent(token)}`;
    await mailer.send(passwordResetMail({ to: user.email, name: user.name, link, validMinutes: PASSWORD_RESET_VALID_MS / 60_000 }));
  }

  return {
    sessionFor,
    hashPassword,
    findUser: repo.findUser,
    findUserWithRoles: repo.findUserWithRoles,

    /** Checks the credentials; throws 401 INVALID_CREDENTIALS with one message for every failure. */
    /** Audit rows for signing in and out (who, when, which request; never the password). */
    recordSignIn: (userId: string, requestId: string | undefined) => repo.recordSessionEvent(userId, 'sign_in', requestId ?? null),
    recordSignOut: (userId: string, requestId: string | undefined) => repo.recordSessionEvent(userId, 'sign_out', requestId ?? null),

    async verifyCredentials(email: string, password: string): Promise<AuthUser> {
      const user = await repo.findUserByEmail(email);
      const ok = await verifyPassword(password, user?.passwordHash ?? (await DUMMY_HASH_PROMISE));
      if (!user || !ok) throw new AppError('INVALID_CREDENTIALS', 'That e-mail and password do not match an account.');
      return { id: user.id, email: user.email, name: user.name };
    },

    /**
     * Answers at once; the lookup and the e-mail happen afterwards so the response time does not
     * reveal whether the account exists. Failures are logged, never shown.
     */
    requestPasswordReset(email: string, requestId: string | undefined): void {
      sendResetLink(email, requestId).catch((error: unknown) => logger.error({ err: error, requestId }, 'password reset e-mail failed'));
    },

    async confirmPasswordReset(token: string, password: string, requestId: string | undefined): Promise<void> {
      const invalid = () => new AppError('TOKEN_INVALID', 'This reset link is not valid any more. Ask for a new one.');
      const tokenHash = hashToken(token);
      // Cheap check first, so made-up tokens cannot make the server hash passwords (about 16 MiB each).
      if (!(await repo.resetTokenIsUsable(tokenHash))) throw invalid();
      const hash = await hashPassword(password);
      // resetPassword checks the token again under a row lock: only one of two racing confirms wins.
      const userId = await repo.resetPassword(tokenHash, hash, { requestId });
      if (!userId) throw invalid();
    },

    async isAdminAnywhere(userId: string): Promise<boolean> {
      const memberships = await repo.listMemberships(userId);
      return memberships.some((m) => m.role === 'admin');
    },
  };
}
export type AuthService = ReturnType<typeof createAuthService>;
