/**
 * /surveys/:surveyId/report — the printable survey report for every member, with the survey map
 * (printable form, from the survey-map feature) embedded.
 */
import { useParams } from 'react-router-dom';
import { Alert } from '@/components/alert';
import { ReportView, useSurveyReport } from '@/features/review';
import { SurveyMapView } from '@/features/survey-map';
import { isApiRequestError } from '@/lib/api';
import { useSignedIn } from './signed-in-layout';

export default function SurveyReportRoute() {
  const { surveyId = '' } = useParams();
  const { membership } = useSignedIn();
  const organisationId = membership?.organisationId ?? '';
  const report = useSurveyReport(organisationId, surveyId);
  if (!membership) return <Alert title="You are not in an organisation yet">Ask an admin for an invitation.</Alert>;
  if (report.isPending) return <p role="status">Preparing the report…</p>;
  if (report.error) {
    const e = report.error;
    return (
      <Alert tone="danger" title={isApiRequestError(e) && e.status === 404 ? 'Survey not found' : 'Could not load the report'}>
        {isApiRequestError(e) ? e.message : 'Try again.'}
      </Alert>
    );
  }
  // The map is for the roles the map server lets in (viewers read the tables and the signature only).
  const map =
    membership.role === 'viewer' ? (
      <p>The map is not shown to viewers; ask a reviewer for a printed copy of the full report.</p>
    ) : (
      <SurveyMapView organisationId={organisationId} surveyId={surveyId} printable />
    );
  return <ReportView report={report.data} map={map} />;
}
