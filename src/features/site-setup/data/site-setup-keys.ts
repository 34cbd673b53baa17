/** Query keys for the site-setup feature (per organisation); never retype these arrays elsewhere. */
export const siteSetupKeys = {
  all: ['site-setup'] as const,
  org: (organisationId: string) => [...siteSetupKeys.all, organisationId] as const,
  sites: (organisationId: string) => [...siteSetupKeys.org(organisationId), 'sites'] as const,
  site: (organisationId: string, siteId: string) => [...siteSetupKeys.org(organisationId), 'site', siteId] as const,
  levels: (organisationId: string, siteId: string) => [...siteSetupKeys.site(organisationId, siteId), 'levels'] as const,
  plan: (organisationId: string, planId: string) => [...siteSetupKeys.org(organisationId), 'plan', planId] as const,
  rooms: (organisationId: string, siteId: string, levelId: string) => [...siteSetupKeys.site(organisationId, siteId), 'rooms', levelId] as const,
  sources: (organisationId: string, siteId: string) => [...siteSetupKeys.site(organisationId, siteId), 'sources'] as const,
  emitters: (organisationId: string, siteId: string) => [...siteSetupKeys.site(organisationId, siteId), 'emitters'] as const,
  siteSurveys: (organisationId: string, siteId: string) => [...siteSetupKeys.site(organisationId, siteId), 'surveys'] as const,
  audit: (organisationId: string, siteId: string) => [...siteSetupKeys.site(organisationId, siteId), 'audit'] as const,
  instruments: (organisationId: string) => [...siteSetupKeys.org(organisationId), 'instruments'] as const,
  zoneSets: (organisationId: string) => [...siteSetupKeys.org(organisationId), 'zone-sets'] as const,
  members: (organisationId: string) => [...siteSetupKeys.org(organisationId), 'members'] as const,
  survey: (organisationId: string, surveyId: string) => [...siteSetupKeys.org(organisationId), 'survey', surveyId] as const,
};

/** The path prefix of every organisation-scoped request. */
export function orgPath(organisationId: string): string {
  return `/api/orgs/${encodeURIComponent(organisationId)}`;
}
