// The survey map feature's public face: the map view (embedded by the survey report as well) and its data operations.
export { SurveyMapView, type SurveyMapViewProps } from './components/survey-map-view';
export { getSurveyMap, surveyMapQueryOptions, useSurveyMap } from './data/get-survey-map';
export { getSurveyCompare, useSurveyCompare } from './data/get-survey-compare';
export { surveyMapKeys } from './data/survey-map-keys';
