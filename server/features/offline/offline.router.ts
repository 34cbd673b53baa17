import { Router } from 'express';
import { SurveyParamsSchema } from '../../../shared/schemas/home';
import type { AuthGuards } from '../../middleware/auth';
import { validate, validated } from '../../middleware/validate';
import type { OfflineService } from './offline.service';

const BundleInput = { params: SurveyParamsSchema };

/** Mounted at /api. GET …/offline: the bundle a device stores to work on a survey with no network. */
export default function offlineRouter(deps: { offline: OfflineService; guards: AuthGuards }): Router {
  const { offline, guards } = deps;
  const router = Router();

  router.get(
    '/orgs/:orgId/surveys/:surveyId/offline',
    guards.requireUser,
    guards.requireMember(['admin', 'reviewer', 'surveyor']),
    validate(BundleInput),
    async (req, res) => {
      const { params } = validated(req, BundleInput);
      const bundle = await offline.bundle(params.orgId, params.surveyId, { userId: req.user!.id, role: req.membership!.role });
      // Survey data is per person and changes: never let a shared cache keep it.
      res.set('Cache-Control', 'private, no-store');
      res.json(bundle);
    },
  );

  return router;
}
