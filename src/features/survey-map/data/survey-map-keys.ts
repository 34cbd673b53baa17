/** Query keys of the survey-map feature; never retype these arrays elsewhere. */
export const surveyMapKeys = {
  all: ['survey-map'] as const,
  candidates: (organisationId: string) => [...surveyMapKeys.all, 'candidates', organisationId] as const,
  map: (organisationId: string, surveyId: string, extraLevelsT: readonly number[]) => [...surveyMapKeys.all, 'map', organisationId, surveyId, extraLevelsT.join(',')] as const,
  compare: (organisationId: string, surveyId: string, withSurveyId: string, extraLevelsT: readonly number[], bearingsDeg: readonly number[]) =>
    [...surveyMapKeys.all, 'compare', organisationId, surveyId, withSurveyId, extraLevelsT.join(','), bearingsDeg.join(',')] as const,
};
