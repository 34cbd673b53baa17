import { Router } from 'express';
import { SweepParamsSchema } from '../../../shared/schemas/emc-sweep';
import { SurveyParamsSchema } from '../../../shared/schemas/home';
import { EVERY_ROLE, type AuthGuards } from '../../middleware/auth';
import { validate, validated } from '../../middleware/validate';
import type { EmcSweepsService } from './emc-sweeps.service';

const ListInput = { params: SurveyParamsSchema };
const OneInput = { params: SweepParamsSchema };

/** Mounted at /api. Every member of the organisation reads sweeps explained (issue 8 §4). */
export default function emcSweepsRouter(deps: { emcSweeps: EmcSweepsService; guards: AuthGuards }): Router {
  const { emcSweeps, guards } = deps;
  const router = Router();
  const read = [guards.requireUser, guards.requireMember(EVERY_ROLE)];

  router.get('/orgs/:orgId/surveys/:surveyId/sweeps', ...read, validate(ListInput), async (req, res) => {
    const { params } = validated(req, ListInput);
    res.json({ sweeps: await emcSweeps.list(params.orgId, params.surveyId) });
  });
  router.get('/orgs/:orgId/surveys/:surveyId/sweeps/:sweepId/explained', ...read, validate(OneInput), async (req, res) => {
    const { params } = validated(req, OneInput);
    res.json(await emcSweeps.explained(params.orgId, params.surveyId, params.sweepId));
  });
  return router;
}
