import { queryOptions, useQuery } from '@tanstack/react-query';
import { SurveyListSchema } from '@shared/schemas/home';
import { api } from '@/lib/api';
import { orgPath, siteSetupKeys } from './site-setup-keys';

/** The organisation's surveys, narrowed to one site (the list endpoint is per organisation). */
export async function listSiteSurveys(organisationId: string, siteId: string, { signal }: { signal?: AbortSignal } = {}) {
  const { surveys } = await api.get(`${orgPath(organisationId)}/surveys`, SurveyListSchema, { signal });
  return surveys.filter((survey) => survey.siteId === siteId);
}

export const siteSurveysQueryOptions = (organisationId: string, siteId: string) =>
  queryOptions({
    queryKey: siteSetupKeys.siteSurveys(organisationId, siteId),
    queryFn: ({ signal }) => listSiteSurveys(organisationId, siteId, { signal }),
    enabled: organisationId !== '' && siteId !== '',
  });

export function useSiteSurveys(organisationId: string, siteId: string) {
  return useQuery(siteSurveysQueryOptions(organisationId, siteId));
}
