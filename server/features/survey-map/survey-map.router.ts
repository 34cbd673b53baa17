import { Router } from 'express';
import { SurveyParamsSchema } from '../../../shared/schemas/home';
import { SurveyCompareQuerySchema, SurveyMapQuerySchema } from '../../../shared/schemas/survey-map';
import type { AuthGuards } from '../../middleware/auth';
import { validate, validated } from '../../middleware/validate';
import type { SurveyMapService } from './survey-map.service';

const MapInput = { params: SurveyParamsSchema, query: SurveyMapQuerySchema };
const CompareInput = { params: SurveyParamsSchema, query: SurveyCompareQuerySchema };
const ExportInput = { params: SurveyParamsSchema };

/** Roles that may look at survey maps; surveyors only for surveys they are assigned to (the service checks). */
export const MAP_ROLES = ['admin', 'reviewer', 'emc', 'surveyor'] as const;

/** Mounted at /api. The survey map, the comparison with an earlier survey, and the GeoJSON export. */
export default function surveyMapRouter(deps: { surveyMap: SurveyMapService; guards: AuthGuards }): Router {
  const { surveyMap, guards } = deps;
  const router = Router();
  const read = [guards.requireUser, guards.requireMember(MAP_ROLES)];
  const caller = (req: { user?: { id: string }; membership?: { role: (typeof MAP_ROLES)[number] | 'viewer' } }) => ({ userId: req.user!.id, role: req.membership!.role });

  router.get('/orgs/:orgId/surveys/:surveyId/map', ...read, validate(MapInput), async (req, res) => {
    const { params, query } = validated(req, MapInput);
    const answer = await surveyMap.map(params.orgId, params.surveyId, caller(req), query);
    // The stored text goes out as it is; the header says whether it was stored or computed now.
    res.set('X-Map-Cache', answer.cache);
    res.set('X-Map-Data-Version', String(answer.dataVersion));
    res.type('application/json').send(answer.payload);
  });
  router.get('/orgs/:orgId/surveys/:surveyId/compare', ...read, validate(CompareInput), async (req, res) => {
    const { params, query } = validated(req, CompareInput);
    res.json(await surveyMap.compare(params.orgId, params.surveyId, caller(req), query));
  });
  router.get('/orgs/:orgId/surveys/:surveyId/exports/survey.geojson', ...read, validate(ExportInput), async (req, res) => {
    const { params } = validated(req, ExportInput);
    const file = await surveyMap.geojson(params.orgId, params.surveyId, caller(req));
    res.set('Content-Disposition', `attachment; filename="${file.fileName}"`);
    res.type('application/geo+json').send(JSON.stringify(file.body));
  });
  return router;
}
