/**
 * /surveys/:surveyId/map — the survey map (issue 7 §1–2) for admins, reviewers and EMC engineers, and
 * for surveyors on the survey's team (the server says 403 NOT_ASSIGNED to others).
 */
import { Link, useParams } from 'react-router-dom';
import type { Role } from '@shared/schemas/common';
import { Alert } from '@/components/alert';
import { SurveyMapView } from '@/features/survey-map';
import { useSignedIn } from './signed-in-layout';

export const SURVEY_MAP_ROLES: readonly Role[] = ['admin', 'reviewer', 'emc', 'surveyor'];

export default function SurveyMapRoute() {
  const { surveyId = '' } = useParams();
  const { membership } = useSignedIn();
  if (!membership) return <Alert title="You are not in an organisation yet">Ask an admin for an invitation.</Alert>;
  if (!SURVEY_MAP_ROLES.includes(membership.role)) {
    return (
      <Alert tone="info" title="Survey maps are for reviewers, admins, EMC engineers and the survey’s surveyors">
        Your role reads the signed survey report instead.
      </Alert>
    );
  }
  return (
    <div className="flex flex-col gap-4">
      <Link to={`/surveys/${surveyId}`} className="self-start font-bold">
        ← Back to the survey
      </Link>
      <SurveyMapView organisationId={membership.organisationId} surveyId={surveyId} />
    </div>
  );
}
