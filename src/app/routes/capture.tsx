/**
 * /surveys/:surveyId/capture — the surveyor's capture screen for a survey taken offline on this device.
 * Surveyors, reviewers and admins capture; other roles are told so.
 */
import { Link, useParams } from 'react-router-dom';
import type { Role } from '@shared/schemas/common';
import { Alert } from '@/components/alert';
import { CaptureScreen } from '@/features/capture/components/capture-screen';
import { useOfflineSurvey } from '@/features/capture/data';
import { useSignedIn } from './signed-in-layout';

export const CAPTURE_ROLES: readonly Role[] = ['surveyor', 'reviewer', 'admin'];

export default function CaptureRoute() {
  const { surveyId = '' } = useParams();
  const { session, membership } = useSignedIn();
  const offline = useOfflineSurvey(surveyId);

  if (!membership || !CAPTURE_ROLES.includes(membership.role)) {
    return (
      <Alert tone="info" title="Capture is for surveyors, reviewers and admins">
        Your role in this organisation can read surveys but not log readings.
      </Alert>
    );
  }
  if (offline === undefined) return <p role="status">Opening the survey on this device…</p>;
  if (offline === null || offline.survey.organisationId !== membership.organisationId) {
    return (
      <Alert tone="warning" title="This survey is not on this device yet">
        <p>Capture works from the copy on this device. Open the survey and take it offline first (that needs a network once).</p>
        <Link to={`/surveys/${surveyId}`} className="mt-2 inline-flex min-h-touch items-center font-bold">
          Open the survey
        </Link>
      </Alert>
    );
  }
  if (offline.survey.state !== 'open') {
    return (
      <Alert tone="info" title="This survey is closed for capture">
        It has been {offline.survey.state === 'submitted' ? 'submitted for review' : 'signed off'}; new readings go into an open survey.
      </Alert>
    );
  }
  return <CaptureScreen offline={offline} userId={session.user.id} />;
}
