/**
 * /surveys/:surveyId/review — the reviewer's table of every reading, decisions, conflicts, sign-off
 * and the readings CSV. For reviewers and admins; others are told who may review.
 */
import { Link, useParams } from 'react-router-dom';
import type { Role } from '@shared/schemas/common';
import { Alert } from '@/components/alert';
import { ReviewScreen } from '@/features/review';
import { useSignedIn } from './signed-in-layout';

export const REVIEW_ROLES: readonly Role[] = ['reviewer', 'admin'];

export default function SurveyReviewRoute() {
  const { surveyId = '' } = useParams();
  const { membership } = useSignedIn();
  if (!membership || !REVIEW_ROLES.includes(membership.role)) {
    return (
      <Alert tone="info" title="Review is for reviewers and admins">
        <p>Your role can read the survey and its report.</p>
        <Link to={`/surveys/${surveyId}/report`} className="mt-2 inline-flex min-h-touch items-center font-bold">
          Open the report
        </Link>
      </Alert>
    );
  }
  return (
    <ReviewScreen
      organisationId={membership.organisationId}
      surveyId={surveyId}
      canReview
      links={
        <>
          <Link to={`/surveys/${surveyId}`} className="inline-flex min-h-touch items-center font-bold">
            Survey page
          </Link>
          <Link to={`/surveys/${surveyId}/map`} className="inline-flex min-h-touch items-center font-bold">
            Survey map
          </Link>
          <Link to={`/surveys/${surveyId}/report`} className="inline-flex min-h-touch items-center font-bold" data-testid="open-report">
            Report
          </Link>
        </>
      }
    />
  );
}
