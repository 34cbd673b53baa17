import { Router } from 'express';
import { OrgParamsSchema } from '../../../shared/schemas/common';
import { UserParamsSchema } from '../../../shared/schemas/home';
import type { AuthGuards } from '../../middleware/auth';
import { validate, validated } from '../../middleware/validate';
import type { MembersService } from './members.service';

const ListInput = { params: OrgParamsSchema };
const OneInput = { params: UserParamsSchema };
const MEMBER_READERS = ['admin', 'reviewer'] as const;

/** Mounted at /api. */
export default function membersRouter(deps: { members: MembersService; guards: AuthGuards }): Router {
  const { members, guards } = deps;
  const router = Router();

  router.get('/orgs/:orgId/members', guards.requireUser, guards.requireMember(MEMBER_READERS), validate(ListInput), async (req, res) => {
    const { params } = validated(req, ListInput);
    res.json({ members: await members.list(params.orgId) });
  });

  router.get('/orgs/:orgId/users/:userId', guards.requireUser, guards.requireMember(MEMBER_READERS), validate(OneInput), async (req, res) => {
    const { params } = validated(req, OneInput);
    res.json(await members.get(params.orgId, params.userId));
  });

  return router;
}
