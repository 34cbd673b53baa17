export { reviewKeys } from './review-keys';
export { getReviewReadings, reviewReadingsQueryOptions, useReviewReadings } from './get-review-readings';
export { decideReadings, useDecideReadings } from './decide-readings';
export { changeSurveyState, useChangeSurveyState, type SurveyStateChange } from './change-survey-state';
export { getSurveyConflicts, resolveConflict, useResolveConflict, useSurveyConflicts } from './survey-conflicts';
export { getSurveyReport, readingsCsvUrl, useSurveyReport } from './get-report';
export { importReadings, useImportReadings, type ImportMode } from './import-readings';
