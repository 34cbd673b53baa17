import { Router } from 'express';
import { z } from 'zod';
import { AcknowledgeFlagSchema, FlagParamsSchema, FlagsQuerySchema, ResolveFlagSchema } from '../../../shared/schemas/emc';
import { UuidSchema } from '../../../shared/schemas/common';
import { auditContextOf } from '../../lib/audit-context';
import { EVERY_ROLE, type AuthGuards } from '../../middleware/auth';
import { validate, validated } from '../../middleware/validate';
import type { EmcService } from './emc.service';

const SurveyParams = z.object({ orgId: UuidSchema, surveyId: UuidSchema });
const RoomsInput = { params: SurveyParams };
const FlagsInput = { params: SurveyParams, query: FlagsQuerySchema };
const AcknowledgeInput = { params: FlagParamsSchema, body: AcknowledgeFlagSchema };
const ResolveInput = { params: FlagParamsSchema, body: ResolveFlagSchema };

/** Mounted at /api. Every member reads the predictions and flags; EMC engineers and admins work the flags. */
export default function emcRouter(deps: { emc: EmcService; guards: AuthGuards }): Router {
  const { emc, guards } = deps;
  const router = Router();
  const read = [guards.requireUser, guards.requireMember(EVERY_ROLE)];
  const work = [guards.requireUser, guards.requireMember(['emc', 'admin'])];

  router.get('/orgs/:orgId/surveys/:surveyId/emc/rooms', ...read, validate(RoomsInput), async (req, res) => {
    const { params } = validated(req, RoomsInput);
    res.json(await emc.rooms(params.orgId, params.surveyId));
  });
  router.get('/orgs/:orgId/surveys/:surveyId/emc/flags', ...read, validate(FlagsInput), async (req, res) => {
    const { params, query } = validated(req, FlagsInput);
    res.json({ flags: await emc.flags(params.orgId, params.surveyId, query.victimDistanceM) });
  });
  router.post('/orgs/:orgId/flags/:flagId/acknowledge', ...work, validate(AcknowledgeInput), async (req, res) => {
    const { params, body } = validated(req, AcknowledgeInput);
    res.json(await emc.acknowledge(params.orgId, params.flagId, body.note, auditContextOf(req)));
  });
  router.post('/orgs/:orgId/flags/:flagId/resolve', ...work, validate(ResolveInput), async (req, res) => {
    const { params, body } = validated(req, ResolveInput);
    res.json(await emc.resolve(params.orgId, params.flagId, body.resolution, auditContextOf(req)));
  });
  return router;
}
