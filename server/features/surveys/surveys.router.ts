import { Router } from 'express';
import { OrgParamsSchema } from '../../../shared/schemas/common';
import { SurveyParamsSchema } from '../../../shared/schemas/home';
import { EVERY_ROLE, type AuthGuards } from '../../middleware/auth';
import { validate, validated } from '../../middleware/validate';
import type { SurveysService } from './surveys.service';

const ListInput = { params: OrgParamsSchema };
const OneInput = { params: SurveyParamsSchema };

/** Mounted at /api. */
export default function surveysRouter(deps: { surveys: SurveysService; guards: AuthGuards }): Router {
  const { surveys, guards } = deps;
  const router = Router();

  router.get('/orgs/:orgId/surveys', guards.requireUser, guards.requireMember(EVERY_ROLE), validate(ListInput), async (req, res) => {
    const { params } = validated(req, ListInput);
    res.json({ surveys: await surveys.list(params.orgId, req.user!.id) });
  });

  router.get('/orgs/:orgId/surveys/:surveyId', guards.requireUser, guards.requireMember(EVERY_ROLE), validate(OneInput), async (req, res) => {
    const { params } = validated(req, OneInput);
    res.json(await surveys.get(params.orgId, params.surveyId, req.user!.id));
  });

  return router;
}
