import { Router } from 'express';
import { OrgParamsSchema } from '../../../shared/schemas/common';
import { SurveyParamsSchema } from '../../../shared/schemas/home';
import { ConflictListQuerySchema, ConflictParamsSchema, PullQuerySchema, PushRequestSchema, ResolveConflictSchema } from '../../../shared/schemas/sync';
import { EVERY_ROLE, type AuthGuards } from '../../middleware/auth';
import { validate, validated } from '../../middleware/validate';
import type { Request } from 'express';
import type { RepeatsService } from './repeats.service';
import { CONFLICT_ROLES, PUSH_ROLES, type SyncActor, type SyncService } from './sync.service';

const PushInput = { params: OrgParamsSchema, body: PushRequestSchema };
const PullInput = { params: OrgParamsSchema, query: PullQuerySchema };
const ConflictListInput = { params: OrgParamsSchema, query: ConflictListQuerySchema };
const ResolveInput = { params: ConflictParamsSchema, body: ResolveConflictSchema };
const RepeatsInput = { params: SurveyParamsSchema };

function actorOf(req: Request): SyncActor {
  return { organisationId: req.membership!.organisationId, userId: req.user!.id, role: req.membership!.role, requestId: req.id === undefined ? undefined : String(req.id) };
}

/** Mounted at /api. */
export default function syncRouter(deps: { sync: SyncService; repeats: RepeatsService; guards: AuthGuards }): Router {
  const { sync, repeats, guards } = deps;
  const router = Router();

  router.post('/orgs/:orgId/sync/push', guards.requireUser, guards.requireMember(PUSH_ROLES), validate(PushInput), async (req, res) => {
    const { body } = validated(req, PushInput);
    res.json(await sync.push(actorOf(req), body));
  });

  router.get('/orgs/:orgId/sync/pull', guards.requireUser, guards.requireMember(EVERY_ROLE), validate(PullInput), async (req, res) => {
    const { query } = validated(req, PullInput);
    res.json(await sync.pull(actorOf(req), query));
  });

  router.get('/orgs/:orgId/sync/conflicts', guards.requireUser, guards.requireMember(CONFLICT_ROLES), validate(ConflictListInput), async (req, res) => {
    const { query } = validated(req, ConflictListInput);
    res.json({ conflicts: await sync.listConflicts(actorOf(req), query) });
  });

  router.post('/orgs/:orgId/sync/conflicts/:conflictId/resolve', guards.requireUser, guards.requireMember(CONFLICT_ROLES), validate(ResolveInput), async (req, res) => {
    const { params, body } = validated(req, ResolveInput);
    res.json(await sync.resolveConflict(actorOf(req), params.conflictId, body));
  });

  router.get('/orgs/:orgId/surveys/:surveyId/repeats', guards.requireUser, guards.requireMember(EVERY_ROLE), validate(RepeatsInput), async (req, res) => {
    const { params } = validated(req, RepeatsInput);
    res.json(await repeats.list(params.orgId, params.surveyId));
  });

  return router;
}
