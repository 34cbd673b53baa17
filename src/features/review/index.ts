// The review feature's public face: the reviewer's screen, the printable report, and their data operations.
export { ReviewScreen, type ReviewScreenProps } from './components/review-screen';
export { ReportView } from './components/report-view';
export * from './data';
