/** Query keys for the EMC feature (per organisation); never retype these arrays elsewhere. */
export const emcKeys = {
  all: ['emc'] as const,
  org: (organisationId: string) => [...emcKeys.all, organisationId] as const,
  watchBands: (organisationId: string) => [...emcKeys.org(organisationId), 'watch-bands'] as const,
  mriBands: (organisationId: string, siteId: string) => [...emcKeys.org(organisationId), 'mri-bands', siteId] as const,
  survey: (organisationId: string, surveyId: string) => [...emcKeys.org(organisationId), 'survey', surveyId] as const,
  flags: (organisationId: string, surveyId: string, victimDistanceM: number) => [...emcKeys.survey(organisationId, surveyId), 'flags', victimDistanceM] as const,
  rooms: (organisationId: string, surveyId: string) => [...emcKeys.survey(organisationId, surveyId), 'rooms'] as const,
};

export function watchBandsPath(organisationId: string): string {
  return `/api/orgs/${encodeURIComponent(organisationId)}/watch-bands`;
}

export function surveyEmcPath(organisationId: string, surveyId: string): string {
  return `/api/orgs/${encodeURIComponent(organisationId)}/surveys/${encodeURIComponent(surveyId)}/emc`;
}
