import { Router } from 'express';
import { OrgParamsSchema } from '../../../shared/schemas/common';
import { SiteParamsSchema, SurveyParamsSchema } from '../../../shared/schemas/home';
import { SurveyAssignmentsInputSchema, SurveyCreateSchema, SurveyUpdateSchema } from '../../../shared/schemas/survey-setup';
import { auditContextOf } from '../../lib/audit-context';
import { EVERY_ROLE, type AuthGuards } from '../../middleware/auth';
import { validate, validated } from '../../middleware/validate';
import type { SurveySetupService } from './survey-setup.service';

const ZoneSetsInput = { params: OrgParamsSchema };
const CreateInput = { params: SiteParamsSchema, body: SurveyCreateSchema };
const OneInput = { params: SurveyParamsSchema };
const UpdateInput = { params: SurveyParamsSchema, body: SurveyUpdateSchema };
const TeamInput = { params: SurveyParamsSchema, body: SurveyAssignmentsInputSchema };

/** Mounted at /api. */
export default function surveySetupRouter(deps: { surveySetup: SurveySetupService; guards: AuthGuards }): Router {
  const { surveySetup, guards } = deps;
  const router = Router();
  const read = [guards.requireUser, guards.requireMember(EVERY_ROLE)];
  const write = [guards.requireUser, guards.requireMember(['admin', 'reviewer'])];

  router.get('/orgs/:orgId/zone-sets', ...read, validate(ZoneSetsInput), async (req, res) => {
    const { params } = validated(req, ZoneSetsInput);
    res.json({ zoneSets: await surveySetup.zoneSets(params.orgId) });
  });
  router.post('/orgs/:orgId/sites/:siteId/surveys', ...write, validate(CreateInput), async (req, res) => {
    const { params, body } = validated(req, CreateInput);
    res.status(201).json(await surveySetup.create(params.orgId, params.siteId, body, auditContextOf(req)));
  });
  router.get('/orgs/:orgId/surveys/:surveyId/settings', ...read, validate(OneInput), async (req, res) => {
    const { params } = validated(req, OneInput);
    res.json(await surveySetup.settings(params.orgId, params.surveyId));
  });
  router.patch('/orgs/:orgId/surveys/:surveyId', ...write, validate(UpdateInput), async (req, res) => {
    const { params, body } = validated(req, UpdateInput);
    res.json(await surveySetup.update(params.orgId, params.surveyId, body, auditContextOf(req)));
  });
  router.put('/orgs/:orgId/surveys/:surveyId/assignments', ...write, validate(TeamInput), async (req, res) => {
    const { params, body } = validated(req, TeamInput);
    res.json(await surveySetup.setTeam(params.orgId, params.surveyId, body, auditContextOf(req)));
  });
  return router;
}
