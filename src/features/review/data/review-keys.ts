/** Query keys for the review feature (per organisation and survey); never retype these arrays elsewhere. */
export const reviewKeys = {
  all: ['review'] as const,
  survey: (organisationId: string, surveyId: string) => [...reviewKeys.all, organisationId, surveyId] as const,
  readings: (organisationId: string, surveyId: string) => [...reviewKeys.survey(organisationId, surveyId), 'readings'] as const,
  conflicts: (organisationId: string, surveyId: string) => [...reviewKeys.survey(organisationId, surveyId), 'conflicts'] as const,
  report: (organisationId: string, surveyId: string) => [...reviewKeys.survey(organisationId, surveyId), 'report'] as const,
};

export const surveyPath = (organisationId: string, surveyId: string) => `/api/orgs/${encodeURIComponent(organisationId)}/surveys/${encodeURIComponent(surveyId)}`;
