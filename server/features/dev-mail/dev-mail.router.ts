/**
 * The messages the local SMTP capture caught, for an admin in dev (there is no real inbox).
 * When the capture is not running (a real SMTP_URL is configured) the route answers 404.
 */
import { Router } from 'express';
import type { DevMailList } from '../../../shared/schemas/dev-mail';
import { forbidden, notFound } from '../../lib/errors';
import type { MailCapture } from '../../lib/mail-capture';
import type { AuthGuards } from '../../middleware/auth';

/** Mounted at /api. */
export default function devMailRouter(deps: { capture: MailCapture | null; auth: { isAdminAnywhere(userId: string): Promise<boolean> }; guards: AuthGuards }): Router {
  const { capture, auth, guards } = deps;
  const router = Router();

  router.get('/dev/mail', guards.requireUser, async (req, res) => {
    if (!(await auth.isAdminAnywhere(req.user!.id))) throw forbidden();
    if (!capture) throw notFound('The local mail capture (it runs only when SMTP_URL is unset)');
    const body: DevMailList = {
      messages: capture
        .list()
        .reverse()
        .map(({ id, to, subject, text, receivedAt }) => ({ id, to, subject, text, receivedAt })),
    };
    res.json(body);
  });

  return router;
}
