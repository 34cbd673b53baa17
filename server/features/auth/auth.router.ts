import { Router } from 'express';
import { PasswordResetConfirmSchema, PasswordResetRequestSchema, SignInSchema } from '../../../shared/schemas/auth';
import type { AuthGuards } from '../../middleware/auth';
import type { RateLimiters } from '../../middleware/rate-limit';
import { clearSessionCookie, endSession, establishSession, type SessionSetup } from '../../middleware/session';
import { validate, validated } from '../../middleware/validate';
import type { AuthService } from './auth.service';

const SignInInput = { body: SignInSchema };
const ResetRequestInput = { body: PasswordResetRequestSchema };
const ResetConfirmInput = { body: PasswordResetConfirmSchema };

export default function authRouter(deps: {
  auth: AuthService;
  guards: AuthGuards;
  limiters: RateLimiters;
  cookieOptions: SessionSetup['cookieOptions'];
}): Router {
  const { auth, guards, limiters } = deps;
  const router = Router();

  router.post('/sign-in', limiters.signInPerIp, validate(SignInInput), limiters.signInPerEmail, async (req, res) => {
    const { body } = validated(req, SignInInput);
    const user = await auth.verifyCredentials(body.email, body.password);
    await establishSession(req, user.id);
    await auth.recordSignIn(user.id, String(req.id));
    res.json(await auth.sessionFor(user));
  });

  // Idempotent: signing out without a session still clears the cookie and answers 204.
  router.post('/sign-out', async (req, res) => {
    const userId = req.session?.userId;
    await endSession(req);
    if (userId) await auth.recordSignOut(userId, String(req.id));
    clearSessionCookie(res, deps.cookieOptions);
    res.status(204).end();
  });

  router.get('/session', guards.requireUser, async (req, res) => {
    res.json(await auth.sessionFor(req.user!));
  });

  router.post('/password-reset/request', limiters.resetPerIp, validate(ResetRequestInput), limiters.resetPerEmail, (req, res) => {
    const { body } = validated(req, ResetRequestInput);
    auth.requestPasswordReset(body.email, String(req.id));
    res.status(202).json({ ok: true });
  });

  router.post('/password-reset/confirm', validate(ResetConfirmInput), async (req, res) => {
    const { body } = validated(req, ResetConfirmInput);
    await auth.confirmPasswordReset(body.token, body.password, String(req.id));
    res.status(204).end();
  });

  return router;
}
