import { Router } from 'express';
import { InvitationAcceptSchema, InvitationCreateSchema, InvitationTokenParamsSchema } from '../../../shared/schemas/auth';
import { OrgParamsSchema } from '../../../shared/schemas/common';
import type { AuthGuards } from '../../middleware/auth';
import { establishSession } from '../../middleware/session';
import { validate, validated } from '../../middleware/validate';
import type { Session } from '../../../shared/schemas/auth';
import type { AuthUser } from '../../middleware/types';
import type { InvitationsService } from './invitations.service';

const TokenInput = { params: InvitationTokenParamsSchema };
const AcceptInput = { params: InvitationTokenParamsSchema, body: InvitationAcceptSchema };
const CreateInput = { params: OrgParamsSchema, body: InvitationCreateSchema };
const OrgInput = { params: OrgParamsSchema };

/** Mounted at /api. */
export default function invitationsRouter(deps: { invitations: InvitationsService; auth: { sessionFor(user: AuthUser): Promise<Session>; recordSignIn(userId: string, requestId: string | undefined): Promise<void> }; guards: AuthGuards }): Router {
  const { invitations, auth, guards } = deps;
  const router = Router();

  router.get('/invitations/:token', validate(TokenInput), async (req, res) => {
    const { params } = validated(req, TokenInput);
    res.json(await invitations.preview(params.token));
  });

  router.post('/invitations/:token/accept', validate(AcceptInput), async (req, res) => {
    const { params, body } = validated(req, AcceptInput);
    const user = await invitations.accept(params.token, body, String(req.id));
    await establishSession(req, user.id);
    await auth.recordSignIn(user.id, String(req.id));
    res.json(await auth.sessionFor(user));
  });

  router.post('/orgs/:orgId/invitations', guards.requireUser, guards.requireMember(['admin']), validate(CreateInput), async (req, res) => {
    const { params, body } = validated(req, CreateInput);
    const invitation = await invitations.invite({ organisationId: params.orgId, email: body.email, role: body.role, inviter: req.user!, requestId: String(req.id) });
    res.status(201).json(invitation);
  });

  router.get('/orgs/:orgId/invitations', guards.requireUser, guards.requireMember(['admin']), validate(OrgInput), async (req, res) => {
    const { params } = validated(req, OrgInput);
    res.json({ invitations: await invitations.listPending(params.orgId) });
  });

  return router;
}
