/** Query keys for the EMC feature (per organisation); never retype these arrays elsewhere. */
export const emcKeys = {
  all: ['emc'] as const,
  org: (organisationId: string) => [...emcKeys.all, organisationId] as const,
  watchBands: (organisationId: string) => [...emcKeys.org(organisationId), 'watch-bands'] as const,
  mriBands: (organisationId: string, siteId: string) => [...emcKeys.org(organisationId), 'mri-bands', siteId] as const,
};

export function watchBandsPath(organisationId: string): string {
  return `/api/orgs/${encodeURIComponent(organisationId)}/watch-bands`;
}
