import type { SurveySummary } from '../../../shared/schemas/home';
import { notFound } from '../../lib/errors';
import type { SurveysRepository } from './surveys.repository';

export function createSurveysService(repo: SurveysRepository) {
  return {
    /** Every role sees every survey of the organisation; `assignedToMe` marks the caller's own. */
    list: (organisationId: string, userId: string): Promise<SurveySummary[]> => repo.list(organisationId, userId),
    async get(organisationId: string, surveyId: string, userId: string): Promise<SurveySummary> {
      const survey = await repo.find(organisationId, surveyId, userId);
      if (!survey) throw notFound('That survey');
      return survey;
    },
  };
}
export type SurveysService = ReturnType<typeof createSurveysService>;
