/** Query keys for the home feature (per organisation); never retype these arrays elsewhere. */
export const homeKeys = {
  all: ['home'] as const,
  sites: (organisationId: string) => [...homeKeys.all, 'sites', organisationId] as const,
  surveys: (organisationId: string) => [...homeKeys.all, 'surveys', organisationId] as const,
};
